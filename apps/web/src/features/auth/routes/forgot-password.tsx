import { Link } from 'react-router-dom';
import { AuthLayout } from '@/components/layout/auth-layout';
import { paths } from '@/config/paths';
import { ForgotPasswordForm } from '../components/forgot-password-form';

export function ForgotPasswordRoute() {
  return (
    <AuthLayout
      title="Forgot your password?"
      description="Enter the e-mail address you sign in with. We will send you a link to choose a new password."
      footer={
        <Link to={paths.auth.signIn.getHref()} className="font-medium underline underline-offset-2">
          Back to sign in
        </Link>
      }
    >
      <ForgotPasswordForm />
    </AuthLayout>
  );
}
