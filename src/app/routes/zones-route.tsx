import { ZonesPage } from '../../features/regulator/components/zones-page';
import { UploadWizard } from '../../features/uploads/components/upload-wizard';

/** Composes the zones list with the upload wizard for closure zones (features do not import each other). */
export function ZonesRoute() {
  return <ZonesPage renderUpload={(onDone) => <UploadWizard kinds={['zone']} onDone={onDone} />} />;
}
