import { LeasesPage } from '../../features/leases/components/leases-page';
import { UploadWizard } from '../../features/uploads/components/upload-wizard';

/** Composes the leases table with the upload wizard (features do not import each other). */
export function LeasesRoute() {
  return <LeasesPage renderUpload={(onDone) => <UploadWizard kinds={['lease', 'coast']} onDone={onDone} />} />;
}
