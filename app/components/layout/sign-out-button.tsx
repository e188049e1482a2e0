import { Button, type ButtonVariant } from '../ui/button.tsx';
import { errorMessage } from '../../lib/api-client.ts';
import { useSignOut } from '../../lib/session/api.ts';

export function SignOutButton({ variant = 'secondary', className = '' }: { variant?: ButtonVariant; className?: string }) {
  const signOut = useSignOut();
  return (
    <div className="flex flex-col gap-1">
      <Button
        variant={variant}
        className={className}
        pending={signOut.isPending || signOut.isSuccess}
        pendingLabel="Signing out…"
        onClick={() => signOut.mutate()}
        data-testid="sign-out"
      >
        Sign out
      </Button>
      {signOut.isError ? (
        <p role="alert" className="text-sm font-semibold text-brick-700">
          {errorMessage(signOut.error)}
        </p>
      ) : null}
    </div>
  );
}
