import { Cautions } from '../../components/ui/cautions';
import { PageHeader } from '../../components/ui/page-header';
import { Empty } from '../../components/ui/states';
import { useMe } from '../../features/account/api/get-me';

const QUESTION = {
  grower: 'How exposed are my leases to river flood water?',
  adviser: "How exposed are my clients' sites to river flood water?",
  regulator: 'Which zones and leases does the current river flow put at risk?',
  admin: 'Who is using Brackline, and is everything running?',
} as const;

export function OverviewPage() {
  const me = useMe();
  const role = me.data?.role ?? 'grower';
  return (
    <div className="space-y-6">
      <PageHeader title="Overview" question={QUESTION[role]} />
      <Cautions />
      <Empty title="Nothing to show yet">
        {role === 'admin'
          ? 'Invite advisers and regulators from the People page; e-mail sent by Brackline appears in the Outbox.'
          : 'Your leases, active closures and latest alerts will appear here once leases are screened. Meanwhile, try the plume calculator.'}
      </Empty>
    </div>
  );
}
