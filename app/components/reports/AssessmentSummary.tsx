// The figures behind a verdict, not only the word.
import type { AssessmentResponse, Verdict } from "~/lib/geo/assessment";
import { formatPosition } from "~/lib/geo/positions";
import { VERDICT_LABELS } from "~/lib/reports/schema";

export type PreviewState =
  | { kind: "idle" }
  | { kind: "loading" }
  | { kind: "error"; message: string; field?: string }
  | { kind: "ready"; result: AssessmentResponse };

export function VerdictBadge({ verdict }: { verdict: Verdict | null }) {
  if (!verdict) return <span className="badge bg-mist text-ink">Uncharted hazard</span>;
  const cls =
    verdict === "off_station" ? "bg-danger-light text-danger" : verdict === "inconclusive" ? "bg-warn-light text-warn" : "bg-kelp-light text-kelp";
  return (
    <span className={`badge ${cls}`} data-verdict={verdict}>
      {VERDICT_LABELS[verdict]}
    </span>
  );
}

const m = (x: number) => (x < 10 ? `${x.toFixed(1)} m` : `${Math.round(x).toLocaleString("en")} m`);
const brg = (x: number) => `${String(Math.round(x) % 360).padStart(3, "0")}°T`;

export function AssessmentFigures({ result }: { result: AssessmentResponse }) {
  return (
    <div className="mt-2 grid gap-2 text-sm">
      <div>
        <VerdictBadge verdict={result.verdict} />
      </div>
      <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1" data-testid="assessment-figures">
        <dt className="text-slate">Displacement</dt>
        <dd data-testid="displacement">
          {m(result.displacement.distanceM)} ({result.displacement.distanceNm.toFixed(3)} M) {brg(result.displacement.bearingTrueDeg)}
        </dd>
        <dt className="text-slate">Swing radius</dt>
        <dd>
          {m(result.swingRadiusM)} {result.swingRadiusSource === "mooring" && result.mooring ? `(√(${result.mooring.chainLengthM}² − ${result.mooring.depthM}²))` : "(stated)"}
        </dd>
        <dt className="text-slate">Uncertainty (95%)</dt>
        <dd data-testid="uncertainty">{m(result.combinedUncertaintyM)}</dd>
        <dt className="text-slate">Charted (WGS 84)</dt>
        <dd className="position">{formatPosition(result.charted.lat, result.charted.lon, "ddm", { decimals: 3 })}</dd>
        <dt className="text-slate">{result.estimate.observationsUsed > 1 ? "Estimate" : "Observed"}</dt>
        <dd className="position">{formatPosition(result.estimate.lat, result.estimate.lon, "ddm", { decimals: 3 })}</dd>
      </dl>
      <p>{result.explanation}</p>
      <p className="text-xs text-slate">{result.rule}</p>
    </div>
  );
}

export function AssessmentSummary({ state }: { state: PreviewState }) {
  switch (state.kind) {
    case "idle":
      return <p className="mt-2 text-sm text-slate">Choose the aid and enter your observation to see the displacement and a first verdict.</p>;
    case "loading":
      return <p className="mt-2 text-sm text-slate">Working it out…</p>;
    case "error":
      return (
        <p className="mt-2 text-sm text-danger" role="alert">
          {state.message}
        </p>
      );
    case "ready":
      return <AssessmentFigures result={state.result} />;
  }
}
