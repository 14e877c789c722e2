import { SignInForm } from '@/features/auth/components/sign-in-form';

export function SignInRoute() {
  return (
    <div className="flex min-h-full items-center justify-center p-4">
      <div className="w-full max-w-sm rounded-lg border border-rule bg-panel p-6">
        <h1 className="mb-1 flex items-center gap-2 text-2xl font-semibold text-accent">
          <img src="/favicon.svg" alt="" className="h-8 w-8" /> Tractwise
        </h1>
        <p className="mb-6 text-sm text-muted">Survey communities, record activations, quote with confidence.</p>
        <SignInForm />
      </div>
    </div>
  );
}
