import { Badge } from '@/components/ui/badge';
import { ButtonLink } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import type { RegisterResource } from '../api/keys';
import { ArchiveAction } from './archive-action';

/** The head of a record's page: where it sits, its name, and Edit and Archive/Restore for those who may. */
export function RecordHeader({
  resource,
  record,
  crumbs,
  canEdit,
}: {
  resource: RegisterResource;
  record: { id: string; name: string; archivedAt: string | null };
  crumbs: { label: string; to?: string }[];
  canEdit: boolean;
}) {
  const archived = !!record.archivedAt;
  return (
    <PageHeader
      crumbs={[...crumbs, { label: record.name }]}
      title={
        <>
          {record.name}
          {archived ? <Badge>Archived</Badge> : null}
        </>
      }
      actions={
        canEdit ? (
          <>
            {archived ? null : <ButtonLink to={`/${resource}/${record.id}/edit`}>Edit</ButtonLink>}
            <ArchiveAction
              resource={resource}
              id={record.id}
              name={record.name}
              archived={archived}
              size="md"
            />
          </>
        ) : null
      }
    />
  );
}
