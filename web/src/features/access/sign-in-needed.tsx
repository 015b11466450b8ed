import { paths } from '../../config/paths';

export function SignInNeeded() {
  return (
    <section className="max-w-2xl">
      <h1 className="text-3xl font-bold tracking-tight">Sign in to continue</h1>
      <div className="mt-6 border-l-4 border-moss bg-panel px-5 py-4">
        <p>This page shows surveillance figures for the sites you are assigned to; sign in first.</p>
        <a href={paths.signIn} className="mt-4 inline-block rounded-sm bg-moss px-4 py-2 font-medium text-white hover:bg-ink">
          Sign in
        </a>
      </div>
    </section>
  );
}
