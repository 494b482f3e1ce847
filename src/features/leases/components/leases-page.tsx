import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { Cautions } from '../../../components/ui/cautions';
import { PageHeader } from '../../../components/ui/page-header';
import { useMe } from '../../account/api/get-me';
import { LeasesTable } from './leases-table';

/** The leases table with the upload wizard one click away (the wizard is composed in by the route). */
export function LeasesPage({ renderUpload }: { renderUpload: (onDone: () => void) => React.ReactNode }) {
  const me = useMe();
  const [uploading, setUploading] = useState(false);
  const canEdit = me.data?.role === 'grower' || me.data?.role === 'adviser';
  return (
    <div className="space-y-6">
      <PageHeader
        title="Leases"
        question="Which leases do you hold or have in mind, and how exposed is each to flood water?"
        actions={
          canEdit && (
            <Button onClick={() => setUploading((u) => !u)} aria-expanded={uploading}>
              {uploading ? 'Close the upload' : 'Upload lease boundaries'}
            </Button>
          )
        }
      />
      {uploading && renderUpload(() => undefined)}
      <Cautions compact />
      {/* A grower's own table needs no account column; advisers and regulators see whose lease it is. */}
      <LeasesTable canEdit={canEdit} showAccount={me.data?.role !== 'grower'} />
    </div>
  );
}
