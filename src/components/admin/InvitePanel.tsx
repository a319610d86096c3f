import type { PlatformRole } from '../../lib/roles';
import { withQueryClient } from '../ui/QueryRoot';
import { InviteForm } from './InviteForm';

function InvitePanel({ roles }: { roles: PlatformRole[] }) {
  return <InviteForm roles={roles} />;
}

export default withQueryClient(InvitePanel);
