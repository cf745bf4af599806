import { getDb } from '@/db';
import { requireActor, requireProjectRole } from '@/lib/auth/current-actor';
import { AppError } from '@/lib/errors/app-error';
import { routeParams } from '@/lib/http/params';
import { handle } from '@/lib/http/route';
import { issueJobStatus } from '@/lib/issue/request';

export const dynamic = 'force-dynamic';

/** Where an issue request stands: queued, rendering, signing, storing, recording, done or failed. */
export function GET(request: Request, { params }: { params: Promise<{ jobId: string }> }): Promise<Response> {
  return handle(request, async () => {
    await requireActor();
    const job = await issueJobStatus(getDb(), (await routeParams(params)).jobId);
    if (!job) throw new AppError('not_found', 'No such issue request.');
    await requireProjectRole(job.project_id);
    return Response.json({
      id: job.id,
      state: job.state,
      step: job.step,
      error: job.error,
      revision: job.revision_code,
      versionNumber: job.version_number,
      revisionId: job.revision_id,
      pdfSha256: job.pdf_sha256,
      verificationCode: job.verification_code,
    });
  });
}
