import type { ComponentType } from 'react';
import type { QueryClient } from '@tanstack/react-query';
import { createBrowserRouter, redirect, type LoaderFunction } from 'react-router-dom';
import { meQueryOptions } from '@/features/auth/api/get-me';
import { AppRoot } from './routes/app-root';
import { RouteError } from './routes/route-error';

/** What a lazy route module exports: its page, and optionally a loader that prefetches its data. */
export type RouteModule = { Component: ComponentType; loader?: (qc: QueryClient) => LoaderFunction };

/** Sends anyone without a session to sign-in, remembering where they were going. */
const requireSession =
  (qc: QueryClient): LoaderFunction =>
  async ({ request }) => {
    const me = await qc.ensureQueryData(meQueryOptions());
    if (!me) {
      const url = new URL(request.url);
      throw redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);
    }
    return null;
  };

export function createAppRouter(qc: QueryClient) {
  const page = (load: () => Promise<RouteModule>) => async () => {
    const m = await load();
    return { Component: m.Component, loader: m.loader?.(qc) };
  };
  return createBrowserRouter([
    { path: '/sign-in', lazy: page(() => import('./routes/sign-in')), ErrorBoundary: RouteError },
    {
      path: '/forgot-password',
      lazy: page(() => import('./routes/forgot-password')),
      ErrorBoundary: RouteError,
    },
    {
      path: '/reset-password',
      lazy: page(() => import('./routes/reset-password')),
      ErrorBoundary: RouteError,
    },
    { path: '/invitation', lazy: page(() => import('./routes/invitation')), ErrorBoundary: RouteError },
    {
      path: '/',
      loader: requireSession(qc),
      Component: AppRoot,
      ErrorBoundary: RouteError,
      HydrateFallback: () => null,
      children: [
        {
          ErrorBoundary: RouteError,
          children: [
            { index: true, lazy: page(() => import('./routes/overview')) },
            { path: 'growers', lazy: page(() => import('./routes/growers')) },
            { path: 'growers/new', lazy: page(() => import('./routes/grower-edit')) },
            { path: 'growers/:id', lazy: page(() => import('./routes/grower')) },
            { path: 'growers/:id/edit', lazy: page(() => import('./routes/grower-edit')) },
            { path: 'farms', lazy: page(() => import('./routes/farms')) },
            { path: 'farms/new', lazy: page(() => import('./routes/farm-edit')) },
            { path: 'farms/:id/edit', lazy: page(() => import('./routes/farm-edit')) },
            { path: 'fields', lazy: page(() => import('./routes/fields')) },
            { path: 'fields/new', lazy: page(() => import('./routes/field-edit')) },
            { path: 'fields/:id', lazy: page(() => import('./routes/field')) },
            { path: 'fields/:id/edit', lazy: page(() => import('./routes/field-edit')) },
            { path: 'fields/:id/boundary', lazy: page(() => import('./routes/field-boundary')) },
            { path: 'seasons', lazy: page(() => import('./routes/seasons')) },
            { path: 'seasons/new', lazy: page(() => import('./routes/season-edit')) },
            { path: 'seasons/:id/edit', lazy: page(() => import('./routes/season-edit')) },
            { path: 'zone-maps', lazy: page(() => import('./routes/zone-maps')) },
            { path: 'zone-maps/new', lazy: page(() => import('./routes/zone-map-new')) },
            { path: 'zone-maps/:id', lazy: page(() => import('./routes/zone-map')) },
            { path: 'planters', lazy: page(() => import('./routes/planters')) },
            { path: 'planters/new', lazy: page(() => import('./routes/planter-edit')) },
            { path: 'planters/:id', lazy: page(() => import('./routes/planter')) },
            { path: 'planters/:id/edit', lazy: page(() => import('./routes/planter-edit')) },
            { path: 'prescriptions', lazy: page(() => import('./routes/prescriptions')) },
            { path: 'prescriptions/new', lazy: page(() => import('./routes/prescription-new')) },
            { path: 'prescriptions/:id', lazy: page(() => import('./routes/prescription')) },
            { path: 'logs', lazy: page(() => import('./routes/logs')) },
            { path: 'logs/new', lazy: page(() => import('./routes/log-new')) },
            { path: 'logs/:id/audit', lazy: page(() => import('./routes/log-audit')) },
            { path: 'products', lazy: page(() => import('./routes/products')) },
            { path: 'products/new', lazy: page(() => import('./routes/product-edit')) },
            { path: 'products/:id', lazy: page(() => import('./routes/product-edit')) },
            { path: 'seed-orders', lazy: page(() => import('./routes/seed-orders')) },
            { path: 'people', lazy: page(() => import('./routes/people')) },
            { path: 'people/invite', lazy: page(() => import('./routes/person-invite')) },
            { path: 'people/:id', lazy: page(() => import('./routes/person')) },
            { path: 'mail', lazy: page(() => import('./routes/mail')) },
            { path: 'account', lazy: page(() => import('./routes/account')) },
            { path: '*', lazy: page(() => import('./routes/not-found')) },
          ],
        },
      ],
    },
  ]);
}
