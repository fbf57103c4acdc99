import { PageHeader } from '@/components/ui/page-header';
import { VerifyDrop } from '@/features/records/components/verify-drop';

export function VerifyRoute() {
  return (
    <div className="max-w-3xl">
      <PageHeader
        title="Verify a calc sheet"
        description="Someone sent you a PDF? Drop it here to learn whether it is a sheet the firm issued, which revision, whether it was altered, and whether a later revision replaced it."
      />
      <VerifyDrop />
    </div>
  );
}
