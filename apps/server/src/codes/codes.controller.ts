import { Body, Controller, Get, HttpCode, Inject, Param, Patch, Post, Query, Res } from '@nestjs/common';
import {
  codeStateQuerySchema,
  createCodeSchema,
  listCodesQuerySchema,
  newEntrySchema,
  updateCodeSchema,
  WRITER_ROLES,
  type Code,
  type CodeStateAnswer,
  type CodeSummary,
  type DosingSheet,
  type NewEntry,
  type StoredEntry,
  type UpdateCodeRequest,
} from '@steadyhand/shared';
import type { Response } from 'express';
import type { z } from 'zod';
import { CurrentUser, Roles } from '../auth/auth.decorators.js';
import type { SessionUser } from '../auth/session-user.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { CodesService } from './codes.service.js';
import { EntriesService } from './entries.service.js';

const [RECORDER, LEADER] = WRITER_ROLES as ['recorder', 'leader'];

@Controller('codes')
export class CodesController {
  constructor(
    @Inject(CodesService) private readonly codes: CodesService,
    @Inject(EntriesService) private readonly entries: EntriesService,
  ) {}

  @Roles(RECORDER, LEADER)
  @Post()
  create(
    @CurrentUser() user: SessionUser,
    @Body(new ZodValidationPipe(createCodeSchema)) body: z.output<typeof createCodeSchema>,
    @Res({ passthrough: true }) res: Response,
  ): { code: Code } {
    const { code, created } = this.codes.create(user, body);
    res.status(created ? 201 : 200);
    return { code };
  }

  @Roles('any')
  @Get()
  list(@Query(new ZodValidationPipe(listCodesQuerySchema)) query: z.output<typeof listCodesQuerySchema>): { codes: Code[] } {
    return { codes: this.codes.list(query.status) };
  }

  @Roles('any')
  @Get(':id')
  get(@Param('id') id: string): { code: Code; entries: StoredEntry[] } {
    return this.codes.withEntries(id);
  }

  @Roles(RECORDER, LEADER)
  @Patch(':id')
  update(
    @CurrentUser() user: SessionUser,
    @Param('id') id: string,
    @Body(new ZodValidationPipe(updateCodeSchema)) body: UpdateCodeRequest,
  ): { code: Code } {
    return { code: this.codes.update(user, id, body) };
  }

  /** 201 for a new entry; 200 with the stored entry when this id was stored before. */
  @Roles(RECORDER, LEADER)
  @Post(':id/entries')
  @HttpCode(201)
  addEntry(
    @CurrentUser() user: SessionUser,
    @Param('id') id: string,
    @Body(new ZodValidationPipe(newEntrySchema)) entry: NewEntry,
    @Res({ passthrough: true }) res: Response,
  ): { entry: StoredEntry } {
    const result = this.entries.add(user, id, entry);
    if (result.duplicate) res.status(200);
    return { entry: result.entry };
  }

  @Roles('any')
  @Get(':id/dosing')
  dosing(@Param('id') id: string): DosingSheet {
    return this.codes.dosing(id);
  }

  /** The state the pad and the wall show at a moment (default now): for the debrief, any moment. */
  @Roles('any')
  @Get(':id/state')
  state(@Param('id') id: string, @Query(new ZodValidationPipe(codeStateQuerySchema)) query: z.output<typeof codeStateQuerySchema>): CodeStateAnswer {
    return this.codes.state(id, query.at);
  }

  @Roles('any')
  @Get(':id/summary')
  summary(@Param('id') id: string): CodeSummary {
    return this.codes.summary(id);
  }
}
