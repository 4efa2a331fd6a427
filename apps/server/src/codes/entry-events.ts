import { EventEmitter } from 'node:events';
import { Injectable, type OnModuleDestroy } from '@nestjs/common';
import type { CodeStatus, EntryAddedEvent } from '@steadyhand/shared';

export interface EntryAddedMeta {
  codeStatus: CodeStatus;
}

/**
 * Told of each newly committed entry, whichever way it came in (REST or socket), so the live
 * gateway broadcasts both the same way.
 */
@Injectable()
export class EntryEvents implements OnModuleDestroy {
  private readonly emitter = new EventEmitter();

  constructor() {
    this.emitter.setMaxListeners(50);
  }

  /** `meta.codeStatus`: the code's status after this entry, so listeners need not look it up. */
  emitAdded(event: EntryAddedEvent, meta: EntryAddedMeta): void {
    this.emitter.emit('added', event, meta);
  }

  emitCodesChanged(codeId: string): void {
    this.emitter.emit('codes-changed', codeId);
  }

  onAdded(listener: (event: EntryAddedEvent, meta: EntryAddedMeta) => void): void {
    this.emitter.on('added', listener);
  }

  onCodesChanged(listener: (codeId: string) => void): void {
    this.emitter.on('codes-changed', listener);
  }

  onModuleDestroy(): void {
    this.emitter.removeAllListeners();
  }
}
