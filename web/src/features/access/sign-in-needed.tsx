import { paths } from '../../config/paths';

export function SignInNeeded() {
  return (
    <section className="max-w-2xl">
      <h1 className="text-2xl font-bold tracking-tight">Sign in to continue</h1>
      <div className="mt-6 note note-ok px-5 py-4">
        <p>This page shows surveillance figures for the sites you are assigned to; sign in first.</p>
        <a href={paths.signIn} className="btn btn-primary mt-4 inline-block px-4 py-2">
          Sign in
        </a>
      </div>
    </section>
  );
}
