import { Body, Controller, Delete, Get, Inject, Param, Patch, Post, Put } from '@nestjs/common';
import { facilitySchema, placeNameInputSchema, unitPatchSchema, type Places } from '@steadyhand/shared';
import { CurrentUser, Roles } from '../auth/auth.decorators.js';
import type { SessionUser } from '../auth/session-user.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { PlacesService } from './places.service.js';

const nameBody = new ZodValidationPipe(placeNameInputSchema);
type NameBody = { name: string };

/** What the start-code picker offers: the facility and its active units, rooms and beds. */
@Controller('places')
export class PlacesController {
  constructor(@Inject(PlacesService) private readonly places: PlacesService) {}

  @Roles('any')
  @Get()
  get(): Places {
    return this.places.all(true);
  }
}

@Controller('admin')
@Roles('admin')
export class PlacesAdminController {
  constructor(@Inject(PlacesService) private readonly places: PlacesService) {}

  @Get('places')
  all(): Places {
    return this.places.all(false);
  }

  @Put('places/facility')
  facility(@CurrentUser() actor: SessionUser, @Body(new ZodValidationPipe(facilitySchema)) body: NameBody): Places {
    return this.places.setFacility(actor, body.name);
  }

  @Post('units')
  addUnit(@CurrentUser() actor: SessionUser, @Body(nameBody) body: NameBody): Places {
    return this.places.addUnit(actor, body.name);
  }

  @Patch('units/:unitId')
  updateUnit(@CurrentUser() actor: SessionUser, @Param('unitId') id: string, @Body(new ZodValidationPipe(unitPatchSchema)) body: { name?: string; active?: boolean }): Places {
    return this.places.updateUnit(actor, id, body);
  }

  @Post('units/:unitId/rooms')
  addRoom(@CurrentUser() actor: SessionUser, @Param('unitId') id: string, @Body(nameBody) body: NameBody): Places {
    return this.places.addRoom(actor, id, body.name);
  }

  @Patch('rooms/:roomId')
  renameRoom(@CurrentUser() actor: SessionUser, @Param('roomId') id: string, @Body(nameBody) body: NameBody): Places {
    return this.places.renameRoom(actor, id, body.name);
  }

  @Delete('rooms/:roomId')
  removeRoom(@CurrentUser() actor: SessionUser, @Param('roomId') id: string): Places {
    return this.places.removeRoom(actor, id);
  }

  @Post('rooms/:roomId/beds')
  addBed(@CurrentUser() actor: SessionUser, @Param('roomId') id: string, @Body(nameBody) body: NameBody): Places {
    return this.places.addBed(actor, id, body.name);
  }

  @Patch('beds/:bedId')
  renameBed(@CurrentUser() actor: SessionUser, @Param('bedId') id: string, @Body(nameBody) body: NameBody): Places {
    return this.places.renameBed(actor, id, body.name);
  }

  @Delete('beds/:bedId')
  removeBed(@CurrentUser() actor: SessionUser, @Param('bedId') id: string): Places {
    return this.places.removeBed(actor, id);
  }
}
