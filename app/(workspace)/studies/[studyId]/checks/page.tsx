import { DF_METHOD_WORDS, GLM_FAMILY_WORDS, LINK_WORDS, STANDARD_ERROR_WORDS } from '@/components/design/analysis-words';
import { formatCount, plural } from '@/lib/format';
import { methodName } from '@/lib/rules/phrases';
import { cap } from '@/lib/rules/text';
import type { Metadata } from 'next';
import Link from 'next/link';
import { FindingsList } from '@/components/design/findings-list';
import { canStudy } from '@/lib/auth/permissions';
import { currentActor } from '@/lib/auth/session';
import { getDesign } from '@/lib/data/designs';
import { getStudy } from '@/lib/data/studies';
import { load } from '@/lib/page-guard';
import { runChecks } from '@/lib/rules/registry';

export const metadata: Metadata = { title: 'Checks' };

export default async function ChecksPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const actor = await currentActor();
  const [study, state] = await Promise.all([load(getStudy(actor, studyId), `/studies/${studyId}/checks`), load(getDesign(actor, studyId))]);
  const { findings, recommendation } = runChecks(state.design);
  const blockers = findings.filter((f) => f.severity === 'blocker').length;
  return (
    <div className="grid gap-6 lg:grid-cols-[1fr_22rem]">
      <section aria-labelledby="findings-heading" className="space-y-3">
        <h2 id="findings-heading" className="text-xl font-bold">
          Findings for revision {state.revision}
        </h2>
        <p className="text-sm text-muted">
          {plural(findings.length, 'finding')}, {plural(blockers, 'blocker')}. Checks run on the saved design;{' '}
          <Link href={`/studies/${studyId}/design`} className="text-brand underline">
            edit the design
          </Link>{' '}
          and they update.
        </p>
        <FindingsList studyId={studyId} findings={findings} canAddress={canStudy(study.role, 'finding.address') && study.status !== 'archived'} />
      </section>
      <aside aria-labelledby="rec-heading" className="space-y-3">
        <div className="rounded-lg border border-line bg-white p-4">
          <h2 id="rec-heading" className="text-lg font-bold">
            Recommended analysis
          </h2>
          <p className="mt-2">
            <code className="block whitespace-pre-wrap rounded bg-slate-100 p-2 text-sm">{recommendation.model}</code>
          </p>
          <dl className="mt-3 space-y-1 text-sm">
            <div>
              <dt className="inline font-semibold">Method: </dt>
              <dd className="inline">{cap(methodName(recommendation.method))}</dd>
            </div>
            {recommendation.family && (
              <div>
                <dt className="inline font-semibold">Family and link: </dt>
                <dd className="inline">
                  {GLM_FAMILY_WORDS[recommendation.family]}
                  {recommendation.link ? `, ${LINK_WORDS[recommendation.link]}` : ''}
                </dd>
              </div>
            )}
            {recommendation.dfMethod && (
              <div>
                <dt className="inline font-semibold">Degrees of freedom: </dt>
                <dd className="inline">{DF_METHOD_WORDS[recommendation.dfMethod]}</dd>
              </div>
            )}
            {recommendation.standardErrors && (
              <div>
                <dt className="inline font-semibold">Standard errors: </dt>
                <dd className="inline">{STANDARD_ERROR_WORDS[recommendation.standardErrors]}</dd>
              </div>
            )}
            {recommendation.unitOfAnalysis && (
              <div>
                <dt className="inline font-semibold">Unit that counts as n: </dt>
                <dd className="inline">
                  {recommendation.unitOfAnalysis.name} ({formatCount(recommendation.unitOfAnalysis.total)}
                  {recommendation.unitOfAnalysis.perArm !== undefined ? `, ${formatCount(recommendation.unitOfAnalysis.perArm)} per arm` : ''})
                </dd>
              </div>
            )}
          </dl>
          {recommendation.adjustments.length > 0 && (
            <ul className="mt-2 list-disc pl-5 text-sm">
              {recommendation.adjustments.map((a) => (
                <li key={a}>{a}</li>
              ))}
            </ul>
          )}
          <p className="mt-2 text-sm">{recommendation.explanation}</p>
        </div>
        <p className="text-sm text-muted">
          These checks are a planning aid, not a substitute for a qualified statistician. Studies with people or animals need review by an ethics board
          (IRB, REC or IACUC); follow local regulations.
        </p>
      </aside>
    </div>
  );
}
