import type { Metadata } from 'next';
import { requirePageMember } from '@/lib/auth/guard';
import { can } from '@/lib/auth/permissions';
import { PageHeader } from '@/components/ui/page-header';
import { EmptyState } from '@/components/ui/empty-state';
import { Term } from '@/components/ui/term';

export const metadata: Metadata = { title: 'Models' };

const TEMPLATES = [
  {
    name: 'Linear stack',
    what: (
      <>
        A tolerance stack-up: contributors with nominal, tolerances and direction around the loop, and the gap’s limits. Results give <Term term="worst case">worst case</Term>, <Term term="RSS" />{' '}
        and Monte Carlo side by side, with <Term term="ppm" /> out of specification and <Term term="Pp/Ppk" />.
      </>
    ),
  },
  {
    name: 'Cost range',
    what: (
      <>
        Line items as <Term term="three-point estimate">three-point estimates</Term>, correlation groups and a risk register. Results give the <Term term="S-curve" /> with <Term term="P80" /> and other
        percentiles, the <Term term="contingency" /> to hold and the chance of exceeding the budget.
      </>
    ),
  },
  { name: 'Formula', what: <>Named uncertain inputs and one or more output formulas, for any other quantity your engineers model.</> },
];

export default async function ModelsPage() {
  const member = await requirePageMember('models.read', '/app/models');
  const isAuthor = can(member.role, 'models.edit');
  return (
    <>
      <PageHeader
        title="Models"
        description="Parametric risk models of your firm: each saved version, who wrote it, who checked it, and where it is published."
      />
      <EmptyState title="Your firm has no models yet">
        {isAuthor ? (
          <p>
            As an author, you build models here from one of the three templates below. Every saved version stays on record; a checker signs a version off before it can be published to a
            client.
          </p>
        ) : member.role === 'checker' ? (
          <p>Authors in your firm build the models. When an author saves a version for review, it appears here for you to compare with the previous one and sign off.</p>
        ) : (
          <p>Authors in your firm build the models and checkers sign off each version. As the account owner you see every model here; invite authors and checkers on the Team page.</p>
        )}
      </EmptyState>
      <section aria-labelledby="templates-heading" className="mt-8">
        <h2 id="templates-heading" className="text-sm font-semibold text-ink-900">
          The three templates
        </h2>
        <ul className="mt-3 grid gap-3 md:grid-cols-3">
          {TEMPLATES.map((t) => (
            <li key={t.name} className="rounded-lg border border-ink-200 bg-white p-4">
              <p className="font-semibold text-ink-900">{t.name}</p>
              <p className="mt-1 text-sm text-ink-600">{t.what}</p>
            </li>
          ))}
        </ul>
      </section>
    </>
  );
}
