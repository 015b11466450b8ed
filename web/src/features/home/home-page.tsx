import { useQuery } from '@tanstack/react-query';
import { Navigate } from 'react-router';
import { sitesQueryOptions } from '../../api/get-sites';
import { PageLoading } from '../../components/feedback/page-loading';
import { paths } from '../../config/paths';
import { useSession } from '../../api/get-session';
import { landingOf } from './landing';

/** The administrator of a Ratewarden without sites (an empty start) lands on the first steps. */
function AdministratorLanding() {
  const sites = useQuery(sitesQueryOptions());
  if (sites.isPending) return <PageLoading />;
  return <Navigate replace to={sites.data && sites.data.length === 0 ? paths.firstRun : landingOf.administrator} />;
}

/** The front door: signed-in people go straight to their role's page, others are asked to sign in. */
export function HomePage() {
  const session = useSession();
  const user = session.data?.user;
  if (session.isPending) return <PageLoading />;
  if (user?.role === 'administrator') return <AdministratorLanding />;
  if (user) return <Navigate replace to={user.role ? landingOf[user.role] : paths.noRole} />;
  return (
    <section className="max-w-3xl">
      <h1 className="text-4xl font-bold tracking-tight">Ratewarden</h1>
      <p className="mt-2 text-lg text-ink-soft">Occupational-health surveillance for workplace exposure cohorts.</p>
      <div className="mt-8 note note-ok px-5 py-4">
        <p>
          Monthly rosters and case lists become person-time incidence rates for every exposure group, compared with the reference group, adjusted for age band
          and site, and watched night after night.
        </p>
        <a href={paths.signIn} className="btn btn-primary mt-4 inline-block px-4 py-2">
          Sign in to continue
        </a>
      </div>
    </section>
  );
}
