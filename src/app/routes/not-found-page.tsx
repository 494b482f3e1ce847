import { Link } from 'react-router-dom';
import { Empty } from '../../components/ui/states';

export function NotFoundPage() {
  return (
    <Empty title="There is no page at this address">
      <Link className="font-semibold text-deep-700 underline" to="/">
        Back to the overview
      </Link>
    </Empty>
  );
}
