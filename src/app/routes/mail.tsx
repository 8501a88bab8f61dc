import { NotAllowed } from '@/components/ui/not-allowed';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { useMail } from '@/features/people/api/get-mail';
import { MailOutbox } from '@/features/people/components/mail-outbox';
import { canManagePeople } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';

function MailPage() {
  const mail = useMail();
  return (
    <>
      <PageHeader
        title="Mail outbox"
        description="E-mail is caught here instead of being sent, so you can follow invitation and password links from this page."
      />
      <QueryState query={mail}>{(messages) => <MailOutbox messages={messages} />}</QueryState>
    </>
  );
}

export function Component() {
  return canManagePeople(useViewer()) ? <MailPage /> : <NotAllowed what="the mail outbox" />;
}
