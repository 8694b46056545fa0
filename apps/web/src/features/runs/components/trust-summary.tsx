import type { FitDiagnosticsView } from "@tributary/contracts";
import { TrustMark, trustStateOf } from "../../../components/trust-mark/trust-mark";
import { formatNumber } from "../../../lib/format";

type ModelDiagnostics = FitDiagnosticsView["pooled"];

// The trust rule (model.md): max R-hat ≤ 1.01, min bulk ESS ≥ 400, no divergences after warm-up.
const RHAT_LIMIT = 1.01;
const ESS_LIMIT = 400;
// E-BFMI below 0.3 hints at poor exploration (common practice; it does not make a run untrustworthy here).
const EBFMI_HINT = 0.3;

type Check = { label: string; value: string; rule: string; ok: boolean | null };

function checksOf(model: ModelDiagnostics): Check[] {
  const ebfmi = model.ebfmi.filter((value): value is number => value !== null);
  const lowestEbfmi = ebfmi.length > 0 ? Math.min(...ebfmi) : null;
  return [
    { label: "Largest R-hat", value: formatNumber(model.maxRhat, 4), rule: `at most ${RHAT_LIMIT}`, ok: model.maxRhat === null ? null : model.maxRhat <= RHAT_LIMIT },
    { label: "Smallest bulk ESS", value: model.minEssBulk === null ? "–" : String(Math.round(model.minEssBulk)), rule: `at least ${ESS_LIMIT}`, ok: model.minEssBulk === null ? null : model.minEssBulk >= ESS_LIMIT },
    { label: "Smallest tail ESS", value: model.minEssTail === null ? "–" : String(Math.round(model.minEssTail)), rule: "for the 5 % and 95 % quantiles", ok: null },
    { label: "Divergent transitions", value: String(model.divergences), rule: "none after warm-up", ok: model.divergences === 0 },
    { label: "Tree-depth limit reached", value: String(model.treeDepthHits), rule: "a sign of slow exploration", ok: null },
    {
      label: "Lowest E-BFMI",
      value: formatNumber(lowestEbfmi, 3),
      rule: `below ${EBFMI_HINT} hints at poor exploration`,
      ok: null,
    },
    { label: "Target acceptance", value: formatNumber(model.targetAcceptance, 2), rule: model.attempts > 1 ? "raised after divergences" : "", ok: null },
  ];
}

function CheckMark({ ok }: { ok: boolean | null }) {
  if (ok === null) return <span className="text-ink-500">for information</span>;
  return ok ? <span className="font-semibold text-stream-700">passes</span> : <span className="font-semibold text-caution-700">fails</span>;
}

function ModelChecks({ title, model }: { title: string; model: ModelDiagnostics }) {
  return (
    <table className="w-full border-collapse text-small">
      <caption className="pb-2 text-left text-small font-semibold text-ink-900">{title}</caption>
      <thead>
        <tr className="border-b border-line text-left text-ink-700">
          <th scope="col" className="py-1 pr-3 font-semibold">
            Check
          </th>
          <th scope="col" className="py-1 pr-3 text-right font-semibold">
            Value
          </th>
          <th scope="col" className="py-1 pr-3 font-semibold">
            Rule
          </th>
          <th scope="col" className="py-1 font-semibold">
            Result
          </th>
        </tr>
      </thead>
      <tbody>
        {checksOf(model).map((check) => (
          <tr key={check.label} className="border-b border-line last:border-b-0">
            <th scope="row" className="py-1.5 pr-3 text-left font-normal text-ink-900">
              {check.label}
            </th>
            <td className="py-1.5 pr-3 text-right tabular-nums">{check.value}</td>
            <td className="py-1.5 pr-3 text-ink-700">{check.rule}</td>
            <td className="py-1.5">
              <CheckMark ok={check.ok} />
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** The trust mark with its reasons in plain words, and the numbers behind it. */
export function TrustSummary({ diagnostics, publishReason }: { diagnostics: FitDiagnosticsView; publishReason: string | null }) {
  const state = trustStateOf(diagnostics.trustworthy);
  return (
    <section aria-labelledby="trust-title" className="rounded-lg border border-line bg-surface p-5 shadow-card">
      <div className="flex flex-wrap items-center gap-3">
        <h2 id="trust-title" className="text-heading font-semibold text-ink-900">
          Can these numbers be trusted?
        </h2>
        <TrustMark state={state} size="md" publishReason={publishReason} />
      </div>
      {diagnostics.trustworthy ? (
        <p className="mt-2 max-w-3xl text-small text-ink-700">
          Every chain agrees (R-hat at most {RHAT_LIMIT}), every parameter has at least {ESS_LIMIT} effective draws and the sampler never diverged after warm-up.
        </p>
      ) : (
        <div className="mt-3 max-w-3xl">
          <h3 className="text-small font-semibold text-caution-700">Why not</h3>
          <ul className="mt-1 list-disc space-y-1 pl-5 text-small text-ink-800">
            {diagnostics.reasons.map((reason) => (
              <li key={reason}>{reason}</li>
            ))}
          </ul>
        </div>
      )}
      {diagnostics.warnings.length > 0 ? (
        <div className="mt-3 max-w-3xl">
          <h3 className="text-small font-semibold text-ink-800">Worth knowing</h3>
          <ul className="mt-1 list-disc space-y-1 pl-5 text-small text-ink-700">
            {diagnostics.warnings.map((warning) => (
              <li key={warning}>{warning}</li>
            ))}
          </ul>
        </div>
      ) : null}
      <div className="mt-5 grid gap-6 lg:grid-cols-2">
        <ModelChecks title="Pooled model" model={diagnostics.pooled} />
        {diagnostics.unpooled ? <ModelChecks title="Each cell alone (comparison)" model={diagnostics.unpooled} /> : null}
      </div>
    </section>
  );
}
