/** Badges for the states the ledger shows everywhere: verdicts, batch states, strike states. */
import { batchStateLabels, dispositionLabels, type BatchState, type DispositionDecision } from "@shared/schemas/batch";
import { verdictLabels, type Verdict } from "@shared/schemas/evaluation";
import { strikeStateLabels, type StrikeState } from "@shared/schemas/strike";
import { Badge } from "./panel";

const verdictTone = { within_tolerance: "moss", out_of_tolerance: "rust", inconclusive: "ochre" } as const;

export function VerdictBadge({ verdict }: { verdict: Verdict | null }) {
  if (!verdict) return <Badge>Not measured</Badge>;
  return <Badge tone={verdictTone[verdict]}>{verdictLabels[verdict]}</Badge>;
}

const batchTone = { open: "steel", in_review: "ochre", released: "moss" } as const;

export function BatchStateBadge({ state }: { state: BatchState }) {
  return <Badge tone={batchTone[state]}>{batchStateLabels[state]}</Badge>;
}

const strikeTone = { queued: "neutral", analysing: "steel", done: "moss", failed: "rust" } as const;

export function StrikeStateBadge({ state }: { state: StrikeState }) {
  return <Badge tone={strikeTone[state]}>{strikeStateLabels[state]}</Badge>;
}

export function DispositionBadge({ decision }: { decision: DispositionDecision }) {
  return <Badge tone={decision === "scrap" ? "rust" : decision === "use_as_is" ? "moss" : "ochre"}>{dispositionLabels[decision]}</Badge>;
}
