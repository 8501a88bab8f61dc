import { ROLE_LABELS } from '@shared/schemas/auth.schema';
import { Facts } from '@/components/ui/facts';
import { PageHeader } from '@/components/ui/page-header';
import { Section } from '@/components/ui/section';
import { ChangePasswordForm } from '@/features/auth/components/change-password-form';
import { UnitSystemSwitch } from '@/features/auth/components/unit-system-switch';
import { useViewer } from '@/lib/viewer';

export function Component() {
  const me = useViewer();
  return (
    <>
      <PageHeader title="Account" description="Your sign-in and how Sowright shows measurements to you." />
      <Facts
        columns={4}
        items={[
          { label: 'Name', value: me.name },
          { label: 'E-mail', value: me.email },
          { label: 'Role', value: ROLE_LABELS[me.role] },
          { label: 'Workspace', value: me.workspace.name },
        ]}
      />
      <Section title="Units">
        <p className="mb-2 text-sm text-ink-soft">
          Areas, row spacing and speeds are shown and typed in these units. Sowright stores metric values, so
          switching changes nothing that is saved.
        </p>
        <UnitSystemSwitch value={me.unitSystem} legend="Show measurements in" />
      </Section>
      <Section title="Change password">
        <ChangePasswordForm />
      </Section>
    </>
  );
}
