import { Global, Module, type OnApplicationShutdown, Inject, type DynamicModule } from '@nestjs/common';
import type { DatabaseHandle, Db } from './database.js';

export const DATABASE = Symbol('DATABASE');
export const DB = Symbol('DB');

class DatabaseCloser implements OnApplicationShutdown {
  constructor(@Inject(DATABASE) private readonly handle: DatabaseHandle) {}
  onApplicationShutdown(): void {
    if (this.handle.sqlite.open) this.handle.sqlite.close();
  }
}

/** Makes the one open database available to every repository. */
@Global()
@Module({})
export class DatabaseModule {
  static forHandle(handle: DatabaseHandle): DynamicModule {
    return {
      module: DatabaseModule,
      providers: [
        { provide: DATABASE, useValue: handle },
        { provide: DB, useValue: handle.db satisfies Db },
        DatabaseCloser,
      ],
      exports: [DATABASE, DB],
    };
  }
}
