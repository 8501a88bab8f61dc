import { ButtonLink } from './button';
import { EmptyState } from './empty-state';

/** Shown when someone opens an address their role does not include. */
export function NotAllowed({ what = 'this page' }: { what?: string }) {
  return (
    <EmptyState title="Not part of your role" action={<ButtonLink to="/">Back to the overview</ButtonLink>}>
      Your role does not include {what}. An admin of the workspace can change roles.
    </EmptyState>
  );
}
