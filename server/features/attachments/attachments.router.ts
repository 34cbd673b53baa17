import { createHash } from 'node:crypto';
import { pipeline } from 'node:stream/promises';
import { Router, type Request } from 'express';
import { ATTACHMENT_MAX_BYTES, AttachmentParamsSchema } from '../../../shared/schemas/sync';
import { AppError } from '../../lib/errors';
import { EVERY_ROLE, type AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import { ATTACHMENT_CONTENT_TYPES, type AttachmentActor, type AttachmentsService } from './attachments.service';

const Input = { params: AttachmentParamsSchema };
const UPLOAD_ROLES = ['admin', 'reviewer', 'surveyor'] as const;

function actorOf(req: Request): AttachmentActor {
  return { organisationId: req.membership!.organisationId, userId: req.user!.id, role: req.membership!.role, requestId: req.id === undefined ? undefined : String(req.id) };
}

/** Reads exactly `length` bytes of the request, hashing as it goes; an aborted request rejects. */
function readBody(req: Request, length: number): Promise<{ body: Buffer; sha256: string }> {
  return new Promise((resolve, reject) => {
    const hash = createHash('sha256');
    const chunks: Buffer[] = [];
    let received = 0;
    const fail = (error: Error) => {
      req.removeAllListeners('data');
      reject(error);
    };
    req.on('data', (chunk: Buffer) => {
      received += chunk.length;
      if (received > length) return fail(new AppError('BAD_REQUEST', 'The body is longer than its Content-Length.'));
      hash.update(chunk);
      chunks.push(chunk);
    });
    req.on('end', () => {
      if (received !== length) return fail(new AppError('BAD_REQUEST', 'The body is shorter than its Content-Length.'));
      resolve({ body: Buffer.concat(chunks), sha256: hash.digest('hex') });
    });
    req.on('aborted', () => fail(new AppError('BAD_REQUEST', 'The upload was interrupted; nothing was kept. Send the whole file again.')));
    req.on('error', fail);
  });
}

/** Mounted at /api. PUT takes the raw file (not JSON, not multipart). */
export default function attachmentsRouter(deps: { attachments: AttachmentsService; guards: AuthGuards }): Router {
  const { attachments, guards } = deps;
  const router = Router();

  router.put('/orgs/:orgId/attachments/:recordId/:kind', guards.requireUser, guards.requireMember(UPLOAD_ROLES), validate(Input), async (req, res) => {
    const { params } = validated(req, Input);
    const contentType = (req.headers['content-type'] ?? '').split(';')[0]!.trim().toLowerCase();
    if (!ATTACHMENT_CONTENT_TYPES[params.kind].includes(contentType)) {
      throw new AppError('UNSUPPORTED_MEDIA_TYPE', `A ${params.kind} is sent as ${ATTACHMENT_CONTENT_TYPES[params.kind].join(' or ')}.`, { accepted: ATTACHMENT_CONTENT_TYPES[params.kind] });
    }
    const lengthHeader = req.headers['content-length'];
    if (lengthHeader === undefined || !/^\d+$/.test(lengthHeader)) throw new AppError('LENGTH_REQUIRED', 'Send the file with a Content-Length header.');
    const length = Number(lengthHeader);
    if (length > ATTACHMENT_MAX_BYTES) throw new AppError('PAYLOAD_TOO_LARGE', 'The file is too large.', { limitBytes: ATTACHMENT_MAX_BYTES });
    if (length === 0) throw new AppError('VALIDATION_FAILED', 'The file is empty.');
    const claimed = String(req.headers['x-content-sha256'] ?? '').trim().toLowerCase();
    if (!/^[0-9a-f]{64}$/.test(claimed)) throw new AppError('VALIDATION_FAILED', 'Send the file’s SHA-256 (64 hex digits) in the X-Content-SHA256 header.');

    const actor = actorOf(req);
    const owner = await attachments.prepareUpload(actor, params.recordId, params.kind, claimed);
    const file = await readBody(req, length);
    if (file.sha256 !== claimed) {
      throw new AppError('CHECKSUM_MISMATCH', 'The file does not match its SHA-256: it was damaged on the way. Nothing was kept; send it again.', { expectedSha256: claimed, receivedSha256: file.sha256 });
    }
    const { created, result } = await attachments.upload(actor, owner, params.kind, { body: file.body, sha256: file.sha256, contentType });
    res.status(created ? 201 : 200).json(result);
  });

  router.get('/orgs/:orgId/attachments/:recordId/:kind', guards.requireUser, guards.requireMember(EVERY_ROLE), validate(Input), async (req, res) => {
    const { params } = validated(req, Input);
    const file = await attachments.download(actorOf(req), params.recordId, params.kind);
    res.setHeader('Content-Type', file.contentType);
    res.setHeader('Content-Length', String(file.bytes));
    res.setHeader('X-Content-SHA256', file.sha256);
    res.setHeader('ETag', `"${file.sha256}"`);
    // The key is content-addressed: this address always serves the same bytes until the record names a new file.
    res.setHeader('Cache-Control', 'private, max-age=0, must-revalidate');
    await pipeline(file.object.body, res);
  });

  return router;
}
