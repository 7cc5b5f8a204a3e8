import { createHash } from 'node:crypto';
import { HttpStatus } from '@nestjs/common';
import { deserializeCheckpoint, ErrorCode, type FlowRun } from '@kiln/shared';
import { ApiException } from '../common/api-error';
import type { Db } from '../database/database.module';

/** A stored checkpoint decoded by the engine, after its SHA-256 was checked. */
export async function loadCheckpointState(db: Db, checkpointId: string): Promise<FlowRun> {
  const row = await db.selectFrom('checkpoints').select(['state', 'sha256']).where('id', '=', checkpointId).executeTakeFirstOrThrow();
  const unreadable = (why: string) => new ApiException(HttpStatus.UNPROCESSABLE_ENTITY, ErrorCode.Unprocessable, `The checkpoint cannot be read: ${why}`);
  if (createHash('sha256').update(row.state).digest('hex') !== row.sha256) throw unreadable('its bytes do not match their checksum');
  try {
    return deserializeCheckpoint(new Uint8Array(row.state.buffer, row.state.byteOffset, row.state.byteLength));
  } catch (error) {
    throw unreadable(error instanceof Error ? error.message : String(error));
  }
}
