import { paths } from '../../config/paths';

/** A signed-in person without a role yet: nothing to show until an administrator assigns one. */
export function NoRolePage({ name }: { name?: string }) {
  return (
    <section className="max-w-2xl">
      <h1 className="text-2xl font-bold tracking-tight">No role yet</h1>
      <div className="mt-6 note note-watch px-5 py-4">
        <p>{name ? `${name}, you are signed in` : 'You are signed in'}, but no role has been given to you yet, so there is nothing Ratewarden may show you.</p>
        <p className="mt-2 font-medium">Ask an administrator to assign you a role and the sites you work for.</p>
      </div>
      <p className="mt-6 text-sm text-ink-soft">
        Meanwhile the{' '}
        <a className="text-accent underline" href={paths.adHoc}>
          ad hoc comparison
        </a>{' '}
        works without any data.
      </p>
    </section>
  );
}
