import { EventEmitter } from 'node:events';
import { Injectable, type OnModuleDestroy } from '@nestjs/common';
import type { EntryAddedEvent } from '@steadyhand/shared';

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

  emitAdded(event: EntryAddedEvent): void {
    this.emitter.emit('added', event);
  }

  emitCodesChanged(codeId: string): void {
    this.emitter.emit('codes-changed', codeId);
  }

  onAdded(listener: (event: EntryAddedEvent) => void): void {
    this.emitter.on('added', listener);
  }

  onCodesChanged(listener: (codeId: string) => void): void {
    this.emitter.on('codes-changed', listener);
  }

  onModuleDestroy(): void {
    this.emitter.removeAllListeners();
  }
}
