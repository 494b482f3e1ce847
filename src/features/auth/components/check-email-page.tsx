import { Link } from 'react-router-dom';

export function CheckEmailPage() {
  return (
    <div>
      <h1 className="text-xl font-bold text-deep-900">Check your e-mail</h1>
      <p className="mt-3 text-sm">If an account uses this address, a sign-in link is on its way. It works for 15 minutes.</p>
      <Link className="mt-4 inline-block font-semibold text-deep-700 underline" to="/sign-in">
        Back to sign-in
      </Link>
    </div>
  );
}
