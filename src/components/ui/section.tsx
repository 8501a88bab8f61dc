import { useId, type ReactNode } from 'react';

/** A titled part of a page, with its own actions on the right. */
export function Section({
  title,
  actions,
  children,
  id,
  className = 'mt-7 first:mt-0',
}: {
  title: string;
  actions?: ReactNode;
  children: ReactNode;
  id?: string;
  className?: string;
}) {
  const autoId = useId();
  const headingId = id ?? autoId;
  return (
    <section aria-labelledby={headingId} className={className}>
      <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
        <h2 id={headingId} className="text-lg font-semibold text-ink">
          {title}
        </h2>
        {actions ? <div className="flex gap-2">{actions}</div> : null}
      </div>
      {children}
    </section>
  );
}
