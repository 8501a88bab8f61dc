import { ButtonLink } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';

export function Component() {
  return (
    <EmptyState title="Nothing at this address" action={<ButtonLink to="/">Back to the overview</ButtonLink>}>
      The link may be mistyped, or the page has moved.
    </EmptyState>
  );
}
