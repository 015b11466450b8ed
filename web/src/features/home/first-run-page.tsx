import { Link } from 'react-router';
import { StateTag } from '../../components/status/state-tag';
import { paths } from '../../config/paths';
import { useGroups } from '../../api/get-groups';
import { useOutcomes } from '../../api/get-outcomes';
import { useSites } from '../../api/get-sites';
import { useAnalysisSettings } from '../../api/get-settings';

interface Step {
  title: string;
  done: boolean;
  who: string;
  text: string;
  to: string;
  link: string;
}

/**
 * The first-run page of an empty start (`npm start -- --empty`): what the administrator sets up,
 * in order, each step with its state read from the data and a link to the page that does it.
 */
export function FirstRunPage() {
  const { data: sites } = useSites();
  const { data: groups } = useGroups();
  const { data: outcomes } = useOutcomes();
  const { data: settings } = useAnalysisSettings();
  const steps: Step[] = [
    {
      title: 'Create the sites',
      done: sites.some((s) => s.retiredAt === null),
      who: 'administrator',
      text: 'Every workplace that sends rosters and case lists, with the code its files use.',
      to: paths.sites,
      link: 'Sites',
    },
    {
      title: 'Invite the people',
      done: false,
      who: 'administrator',
      text: 'The hygienist, safety managers (with their sites) and the occupational physician; each signs in with the e-mail you enter.',
      to: paths.admin,
      link: 'People',
    },
    {
      title: 'Check the analysis settings',
      done: settings.current !== null,
      who: 'administrator or hygienist',
      text: 'Person-time basis, rate multiplier, confidence level, counted case statuses and age bands. Until a version is saved, the worker’s defaults become version 1.',
      to: paths.settings,
      link: 'Analysis settings',
    },
    {
      title: 'Describe the exposure groups and the reference group',
      done: groups.some((g) => g.isReference),
      who: 'hygienist',
      text: 'The groups of the rosters, their ordinal exposure levels, and the group every other is compared with.',
      to: paths.groups,
      link: 'Exposure groups',
    },
    {
      title: 'Define the outcomes',
      done: outcomes.length > 0,
      who: 'hygienist',
      text: 'Each outcome with its case definition, counting rule and exposure lag.',
      to: paths.outcomes,
      link: 'Outcomes',
    },
    {
      title: 'Upload the first roster and case list',
      done: false,
      who: 'hygienist',
      text: 'From the templates on the intake page; each file is checked before it is applied, and a run follows.',
      to: paths.intakes,
      link: 'Intakes',
    },
  ];
  return (
    <section className="max-w-3xl">
      <h1 className="text-2xl font-bold tracking-tight">First steps</h1>
      <p className="mt-2 text-ink-soft">This Ratewarden started without demo data. Set it up in this order; each step links to its page.</p>
      <ol aria-label="Set-up steps" className="mt-6 space-y-4">
        {steps.map((s, i) => (
          <li key={s.title} className="note note-plain px-4 py-3">
            <div className="flex flex-wrap items-center gap-3">
              <h2 className="text-lg font-semibold">
                {i + 1}. {s.title}
              </h2>
              {s.done ? <StateTag text="done" tone="good" /> : <StateTag text="to do" tone="attention" />}
            </div>
            <p className="mt-1">{s.text}</p>
            <p className="mt-1 text-sm text-ink-soft">
              By the {s.who}:{' '}
              <Link className="text-accent underline" to={s.to}>
                {s.link}
              </Link>
            </p>
          </li>
        ))}
      </ol>
    </section>
  );
}
