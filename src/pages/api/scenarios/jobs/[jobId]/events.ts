import { endpoint, requireActor } from '../../../../../lib/http';
import { followJob, jobStatus } from '../../../../../lib/studio/analysis';
import type { JobEvent } from '../../../../../lib/studio/analysis-types';

const HEARTBEAT_MS = 15_000;

/** The job's progress and its end as Server-Sent Events; the stream closes after the last one. */
export const GET = endpoint(({ locals, params, request }) => {
  const actor = requireActor(locals);
  jobStatus(actor, params.jobId!); // 404 before the stream opens
  const encoder = new TextEncoder();
  let stop = () => {};
  const stream = new ReadableStream<Uint8Array>({
    start(controller) {
      let open = true;
      const close = () => {
        if (!open) return;
        open = false;
        clearInterval(heartbeat);
        unsubscribe();
        controller.close();
      };
      const send = (event: JobEvent) => {
        if (!open) return;
        controller.enqueue(encoder.encode(`data: ${JSON.stringify(event)}\n\n`));
        if (event.type !== 'progress') queueMicrotask(close);
      };
      const heartbeat = setInterval(() => open && controller.enqueue(encoder.encode(': still working\n\n')), HEARTBEAT_MS);
      const unsubscribe = followJob(actor, params.jobId!, send);
      stop = close;
      request.signal.addEventListener('abort', close);
    },
    cancel() {
      stop();
    },
  });
  return new Response(stream, {
    headers: { 'content-type': 'text/event-stream; charset=utf-8', 'cache-control': 'no-store', 'x-accel-buffering': 'no' },
  });
});
