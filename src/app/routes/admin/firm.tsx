import { PageHeader, Panel } from '@/components/ui/page-header';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { useFirm } from '@/features/firm/api/get-firm';
import { FirmForm } from '@/features/firm/components/firm-form';
import { SigningKey } from '@/features/firm/components/signing-key';
import { SigningKeys } from '@/features/firm/components/signing-keys';
import { AuditChain } from '@/features/firm/components/audit-chain';
import { ImportLimitsForm } from '@/features/firm/components/import-limits-form';
import { isAdmin } from '@/lib/permissions';
import { useCurrentUser } from '../../current-user';

export function FirmRoute() {
  const user = useCurrentUser();
  const firm = useFirm();
  return (
    <div>
      <PageHeader title="Firm" description="The name, address and paper size that every calc sheet’s title block carries." />
      {firm.isPending ? (
        <LoadingState label="Loading the firm’s details…" />
      ) : firm.isError ? (
        <ErrorState title="The firm’s details could not be loaded" error={firm.error} onRetry={() => void firm.refetch()} />
      ) : (
        <div className="flex flex-col gap-6">
          <Panel title="Title block">
            <FirmForm firm={firm.data} editable={isAdmin(user.role)} />
          </Panel>
          <Panel title="Drawing limits">
            <ImportLimitsForm editable={isAdmin(user.role)} />
          </Panel>
          <Panel title="Signing key">
            <SigningKey />
          </Panel>
          <Panel title="All signing keys">
            <SigningKeys />
          </Panel>
          <Panel title="Audit log chain">
            <AuditChain />
          </Panel>
        </div>
      )}
    </div>
  );
}
