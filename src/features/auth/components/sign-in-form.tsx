import { useEffect, useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'react-router-dom';
import { signInSchema, type Me } from '@shared/schemas/auth.schema';
import { isApiError } from '@/lib/api-client';
import { Button } from '@/components/ui/button';
import { FormField } from '@/components/ui/form-field';
import { Input } from '@/components/ui/input';
import { Notice } from '@/components/ui/notice';
import { useSignIn } from '../api/sign-in';

/** Seconds left until a moment, ticking once a second; 0 when past. */
function useSecondsUntil(until: number | null) {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    if (until === null) return;
    const t = window.setInterval(() => setNow(Date.now()), 1000);
    return () => window.clearInterval(t);
  }, [until]);
  return until === null ? 0 : Math.max(0, Math.ceil((until - now) / 1000));
}

export function SignInForm({ onSignedIn }: { onSignedIn: (me: Me) => void }) {
  const form = useForm({ resolver: zodResolver(signInSchema), defaultValues: { email: '', password: '' } });
  const signIn = useSignIn();
  const [message, setMessage] = useState<string | null>(null);
  const [lockedUntil, setLockedUntil] = useState<number | null>(null);
  const secondsLeft = useSecondsUntil(lockedUntil);
  const locked = secondsLeft > 0;
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    setMessage(null);
    signIn.mutate(values, {
      onSuccess: onSignedIn,
      onError: (e) => {
        if (isApiError(e) && e.status === 429) {
          setLockedUntil(Date.now() + (e.retryAfterSeconds ?? 60) * 1000);
        } else if (isApiError(e) && (e.status === 401 || e.status === 400)) {
          setMessage('The e-mail or password is not right.');
        } else {
          setMessage(e instanceof Error ? e.message : 'Could not sign in.');
        }
      },
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {locked ? (
        <Notice tone="caution" title="Too many attempts">
          Try again in <span className="font-mono">{secondsLeft}</span> s
          {secondsLeft > 90 ? ` (about ${Math.round(secondsLeft / 60)} min)` : ''}.
        </Notice>
      ) : message ? (
        <Notice tone="danger">{message}</Notice>
      ) : null}
      <FormField label="E-mail" error={errors.email?.message}>
        <Input type="email" autoComplete="username" autoFocus {...form.register('email')} />
      </FormField>
      <FormField label="Password" error={errors.password?.message}>
        <Input type="password" autoComplete="current-password" {...form.register('password')} />
      </FormField>
      <Button type="submit" variant="primary" className="w-full" busy={signIn.isPending} disabled={locked}>
        Sign in
      </Button>
      <p className="text-center text-sm">
        <Link to="/forgot-password" className="text-clay-700 underline-offset-2 hover:underline">
          Forgot password?
        </Link>
      </p>
    </form>
  );
}
