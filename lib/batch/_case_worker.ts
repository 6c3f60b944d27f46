/**
 * The worker of `runBatch`: runs the cases it is sent, one at a time, and
 * posts their outcomes.
 *
 * Messages in: `{type: "case", job, context}` and `{type: "claimed", index,
 * denied}`. Messages out: `{type: "claim", index, caseId}` and `{type:
 * "done", outcome}`.
 *
 * @module
 */

import type { CaseJob, CaseRunContext } from "./batch_types.ts";
import { processCase } from "./process_case.ts";

// The worker's global scope, typed here so the file checks with the window lib.
const scope = self as unknown as {
  postMessage(message: unknown): void;
  onmessage: ((event: MessageEvent) => void) | null;
};

const waiting = new Map<number, (denied: string | null) => void>();

scope.onmessage = (event: MessageEvent) => {
  const msg = event.data as
    | { type: "case"; job: CaseJob; context: CaseRunContext }
    | { type: "claimed"; index: number; denied: string | null };
  if (msg.type === "claimed") {
    waiting.get(msg.index)?.(msg.denied);
    waiting.delete(msg.index);
    return;
  }
  const index = msg.job.case.index;
  processCase(msg.job, msg.context, (caseId) =>
    new Promise((resolve) => {
      waiting.set(index, resolve);
      scope.postMessage({ type: "claim", index, caseId });
    })).then((outcome) => scope.postMessage({ type: "done", outcome }));
};
