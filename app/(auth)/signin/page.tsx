import { Suspense } from "react";
import { SignInForm } from "./_components/SignInForm";

export const dynamic = "force-dynamic";

export default function SignInPage() {
  return (
    <main className="signin">
      <h1>Beamgate</h1>
      <p className="subtitle">Sign in to review and record antenna changes.</p>
      <div className="panel">
        <Suspense>
          <SignInForm />
        </Suspense>
      </div>
    </main>
  );
}
