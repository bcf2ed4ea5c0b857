import { useNavigate, useSearchParams } from 'react-router-dom';
import { AuthLayout } from '@/components/layout/auth-layout';
import { safeNextPath } from '@/lib/auth';
import { SignInForm } from '../components/sign-in-form';

export function SignInRoute() {
  const navigate = useNavigate();
  const [searchParams] = useSearchParams();
  const next = searchParams.get('next');

  return (
    <AuthLayout
      title="Sign in"
      description="Inspection companies, agents, buyers and sellers sign in here."
      footer={<p>New to Underfoot? Accounts are created by invitation from your inspection company or agent.</p>}
    >
      <SignInForm onSignedIn={(user) => void navigate(safeNextPath(next, user.role), { replace: true })} />
    </AuthLayout>
  );
}
