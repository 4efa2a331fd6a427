import { ForbiddenException, HttpException, Inject, Logger, Optional, type OnModuleDestroy } from '@nestjs/common';
import {
  ConnectedSocket,
  MessageBody,
  SubscribeMessage,
  WebSocketGateway,
  WebSocketServer,
  type OnGatewayConnection,
  type OnGatewayDisconnect,
  type OnGatewayInit,
} from '@nestjs/websockets';
import {
  codeJoinSchema,
  codeLogSchema,
  codeRefillSchema,
  entryAddSchema,
  hasAnyRole,
  LIVE_NAMESPACE,
  timePingSchema,
  WRITER_ROLES,
  type CodeJoinAck,
  type CodeLogAck,
  type CodeRefillAck,
  type EntryAddAck,
  type LiveClientToServer,
  type LiveError,
  type LiveServerToClient,
  type TimePingAck,
} from '@steadyhand/shared';
import type { IncomingMessage, ServerResponse } from 'node:http';
import type { Namespace, Socket } from 'socket.io';
import type { z } from 'zod';
import { AuthPassportService } from '../auth/auth-passport.service.js';
import { SessionService } from '../auth/session.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';
import { jsonShapeProblem } from '../common/json-limits.js';
import { uniqueConflict } from '../common/unique-conflict.js';
import { describeZodError } from '../common/zod-validation.pipe.js';
import { MetricsService } from '../metrics/metrics.service.js';
import { UsersService } from '../users/users.service.js';
import { CodesService } from './codes.service.js';
import { EntriesService } from './entries.service.js';
import { EntryEvents } from './entry-events.js';

interface SocketData {
  sid: string;
  userId: string;
}
type LiveSocket = Socket<LiveClientToServer, LiveServerToClient, Record<string, never>, SocketData>;
type LiveNamespace = Namespace<LiveClientToServer, LiveServerToClient, Record<string, never>, SocketData>;
type HandshakeRequest = IncomingMessage & { sessionID?: string; user?: SessionUser; _query?: Record<string, string> };
type Middleware = (req: HandshakeRequest, res: ServerResponse, next: (err?: unknown) => void) => void;

/** How long a socket's person is trusted before it is read from the database again. */
const USER_RECHECK_MS = 3000;
/** How often open sockets are checked against their sessions' idle and absolute timeouts. */
const SESSION_SWEEP_MS = 2000;
const SESSION_ENDED = 'Your session has ended: sign in again. What you recorded stays on this device and is sent once you have.';

export const roomOf = (codeId: string) => `code:${codeId}`;
/** Every screen that shows the board of live codes. */
const BOARD_ROOM = 'board';

/**
 * The live link for every screen of a code. Sign-in comes from the same session cookie as the
 * REST routes; each message is validated and authorised on its own; an entry is acknowledged
 * only after its commit, then broadcast to the code's room.
 */
@WebSocketGateway({
  namespace: LIVE_NAMESPACE,
  // A lost link must show within 10 s on every screen.
  pingInterval: 4000,
  pingTimeout: 4000,
  maxHttpBufferSize: 64 * 1024,
  cors: false,
})
export class LiveGateway implements OnGatewayInit<LiveNamespace>, OnGatewayConnection<LiveSocket>, OnGatewayDisconnect<LiveSocket>, OnModuleDestroy {
  private readonly logger = new Logger(LiveGateway.name);
  private readonly userCache = new Map<string, { user: SessionUser; at: number }>();
  private sweepTimer: NodeJS.Timeout | undefined;
  @WebSocketServer() private readonly nsp!: LiveNamespace;

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(SessionService) private readonly sessions: SessionService,
    @Inject(AuthPassportService) private readonly auth: AuthPassportService,
    @Inject(UsersService) private readonly users: UsersService,
    @Inject(EntriesService) private readonly entries: EntriesService,
    @Inject(EntryEvents) private readonly events: EntryEvents,
    @Inject(CodesService) private readonly codes: CodesService,
    @Optional() @Inject(MetricsService) private readonly metrics?: MetricsService,
  ) {}

  afterInit(nsp: LiveNamespace): void {
    const onlyOnHandshake = (mw: Middleware): Middleware => (req, res, next) =>
      req._query?.sid === undefined ? mw(req, res, next) : next();
    const { passport } = this.auth;
    const chain: unknown[] = [this.sessions.middleware, passport.initialize(), passport.session()];
    for (const mw of chain) nsp.server.engine.use(onlyOnHandshake(mw as Middleware));

    nsp.use((socket, next) => {
      const req = socket.request as HandshakeRequest;
      const origin = req.headers.origin;
      if (origin && !this.config.allowedOrigins.includes(origin)) return next(new Error(`origin not allowed: ${origin}`));
      if (!req.user || !req.sessionID) return next(new Error('unauthorized: sign in first'));
      // Like every REST route but the password change: a temporary password opens nothing else.
      if (req.user.mustChangePassword) return next(new Error('password-change-required: choose a new password first'));
      socket.data = { sid: req.sessionID, userId: req.user.id };
      next();
    });

    this.events.onAdded((event) => nsp.to(roomOf(event.codeId)).emit('entry:added', event));
    this.events.onCodesChanged((codeId) => nsp.to(BOARD_ROOM).emit('codes:changed', { codeId }));
    this.sessions.events.on('ended', (sid: string) => this.disconnectSession(sid));
    this.sessions.events.on('user-disabled', (userId: string) => this.disconnectUser(userId));
    // A socket lives no longer than its session: idle or absolute timeout, it closes.
    this.sweepTimer = setInterval(() => this.closeExpired(), SESSION_SWEEP_MS);
    this.sweepTimer.unref();
  }

  onModuleDestroy(): void {
    clearInterval(this.sweepTimer);
  }

  private closeExpired(): void {
    const alive = new Map<string, boolean>();
    for (const socket of this.nsp.sockets.values()) {
      const { sid } = socket.data;
      if (!alive.has(sid)) alive.set(sid, this.sessions.store.liveSession(sid) !== undefined);
      if (!alive.get(sid)) socket.disconnect(true);
    }
  }

  /**
   * The session behind a socket, checked at each message that reads or writes a code: an
   * expired one is answered 401 and the socket closes once the answer is sent.
   */
  private sessionAlive(socket: LiveSocket): boolean {
    if (this.sessions.store.liveSession(socket.data.sid)) return true;
    // After the acknowledgement has gone out (Nest sends it once this handler has returned).
    setTimeout(() => socket.disconnect(true), 200).unref();
    return false;
  }

  handleConnection(socket: LiveSocket): void {
    this.metrics?.socketConnections.inc();
    this.metrics?.socketsOpen.inc();
    void socket.join(BOARD_ROOM);
    // Every message is bounded before any handler sees it: one nested too deep gets a 400
    // acknowledgement, which a device's outbox takes as final (never "retry").
    socket.use((packet, next) => {
      const ack: unknown = packet[packet.length - 1];
      const args = typeof ack === 'function' ? packet.slice(1, -1) : packet.slice(1);
      const problem = args.map((arg) => jsonShapeProblem(arg, 'The message')).find(Boolean);
      if (!problem) return next();
      if (typeof ack === 'function') (ack as (res: LiveError) => void)({ ok: false, status: 400, error: problem });
    });
  }

  private disconnectSession(sid: string): void {
    for (const socket of this.nsp.sockets.values()) {
      if (socket.data.sid === sid) socket.disconnect(true);
    }
  }

  /** Disconnects every live screen of one person (used when an account is disabled). */
  disconnectUser(userId: string): void {
    for (const socket of this.nsp.sockets.values()) {
      if (socket.data.userId === userId) socket.disconnect(true);
    }
  }

  /**
   * The person as they are now, read again at most every few seconds: a disabled account's
   * sockets are closed at once by the 'user-disabled' event, and a role change counts within
   * USER_RECHECK_MS, without two queries on every tap.
   */
  private currentUser(socket: LiveSocket): SessionUser | undefined {
    const cached = this.userCache.get(socket.id);
    if (cached && Date.now() - cached.at < USER_RECHECK_MS) return cached.user;
    const user = this.users.sessionUser(socket.data.userId);
    if (!user) {
      this.userCache.delete(socket.id);
      socket.disconnect(true);
      return undefined;
    }
    this.userCache.set(socket.id, { user, at: Date.now() });
    return user;
  }

  handleDisconnect(socket: LiveSocket): void {
    this.metrics?.socketsOpen.dec();
    this.userCache.delete(socket.id);
  }

  @SubscribeMessage('code:join')
  join(@ConnectedSocket() socket: LiveSocket, @MessageBody() payload: unknown): CodeJoinAck {
    return this.answer(() => {
      const request = this.parse(codeJoinSchema, payload);
      if (!this.sessionAlive(socket)) return { ok: false, status: 401, error: SESSION_ENDED };
      if (!this.currentUser(socket)) return { ok: false, status: 401, error: 'signed out' };
      const { entries, cursor, count } = this.entries.entriesAfter(request.codeId, request.after ?? 0);
      void socket.join(roomOf(request.codeId));
      return { ok: true, entries, cursor, count };
    });
  }

  /** The ids in a code's log, for a device that keeps its own entries to send back what is missing. */
  @SubscribeMessage('code:log')
  log(@ConnectedSocket() socket: LiveSocket, @MessageBody() payload: unknown): CodeLogAck {
    return this.answer(() => {
      const request = this.parse(codeLogSchema, payload);
      if (!this.sessionAlive(socket)) return { ok: false, status: 401, error: SESSION_ENDED };
      if (!this.currentUser(socket)) return { ok: false, status: 401, error: 'signed out' };
      return { ok: true, ...this.entries.logIds(request.codeId) };
    });
  }

  /** A device starts again a code this server does not know (restored from an older copy). */
  @SubscribeMessage('code:refill')
  refillCode(@ConnectedSocket() socket: LiveSocket, @MessageBody() payload: unknown): CodeRefillAck {
    return this.answer(() => {
      const request = this.parse(codeRefillSchema, payload);
      if (!this.sessionAlive(socket)) return { ok: false, status: 401, error: SESSION_ENDED };
      const user = this.currentUser(socket);
      if (!user) return { ok: false, status: 401, error: 'signed out' };
      if (!hasAnyRole(user.roles, WRITER_ROLES)) throw new ForbiddenException('Only a recorder or a team leader can start a code');
      const { code, created } = this.codes.create(user, request.code, { refill: true, protocolVersion: request.protocolVersion });
      return { ok: true, code, created };
    });
  }

  @SubscribeMessage('code:leave')
  leave(@ConnectedSocket() socket: LiveSocket, @MessageBody() payload: unknown): void {
    const parsed = codeJoinSchema.pick({ codeId: true }).safeParse(payload);
    if (parsed.success) void socket.leave(roomOf(parsed.data.codeId));
  }

  @SubscribeMessage('entry:add')
  add(@ConnectedSocket() socket: LiveSocket, @MessageBody() payload: unknown): EntryAddAck {
    const receivedAt = new Date().toISOString();
    return this.answer(() => {
      const request = this.parse(entryAddSchema, payload);
      if (!this.sessionAlive(socket)) return { ok: false, status: 401, error: SESSION_ENDED };
      const user = this.currentUser(socket);
      if (!user) return { ok: false, status: 401, error: 'signed out' };
      // A tap is activity: the idle timeout starts again, as for a request.
      this.sessions.store.touchIdle(socket.data.sid);
      const { entry, duplicate } = this.entries.add(user, request.codeId, request.entry, receivedAt, { refill: request.refill });
      return { ok: true, entry, duplicate };
    });
  }

  @SubscribeMessage('time:ping')
  ping(@MessageBody() payload: unknown): TimePingAck | LiveError {
    const t1 = Date.now();
    const parsed = timePingSchema.safeParse(payload);
    if (!parsed.success) return { ok: false, status: 400, error: describeZodError(parsed.error) };
    return { t0: parsed.data.t0, t1, t2: Date.now() };
  }

  private parse<T extends z.ZodType>(schema: T, payload: unknown): z.output<T> {
    const parsed = schema.safeParse(payload);
    if (!parsed.success) throw new HttpException(describeZodError(parsed.error), 400);
    return parsed.data;
  }

  /** A bad message gets an error acknowledgement; the connection stays open. */
  private answer<T>(work: () => T): T | LiveError {
    try {
      return work();
    } catch (err) {
      if (err instanceof HttpException) {
        const body = err.getResponse();
        const message: unknown = typeof body === 'string' ? body : ((body as { message?: unknown }).message ?? err.message);
        const text = Array.isArray(message) ? message.map(String).join('; ') : typeof message === 'string' ? message : err.message;
        return { ok: false, status: err.getStatus(), error: text };
      }
      const conflict = uniqueConflict(err);
      if (conflict) return { ok: false, status: 409, error: (conflict.getResponse() as { message: string }).message };
      this.logger.error(err instanceof Error ? (err.stack ?? err.message) : String(err));
      return { ok: false, status: 500, error: 'The server could not store this; it will be retried' };
    }
  }
}
