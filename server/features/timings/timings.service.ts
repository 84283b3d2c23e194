import type { SavedTimingDto } from '@shared/api/dto';
import type { CreateTimingBody } from '@shared/api/timing.schema';
import { evaluateTiming } from '@shared/drive/evaluate';
import { panelTypeById } from '@shared/model/panel-types';
import { AppError, notFound } from '../../core/app-error';
import { SavedTiming } from './timing.model';

/** The saved fields plus what follows from them; an impossible request is a 400 with the reason. */
export function evaluate(
  body: Pick<CreateTimingBody, 'name' | 'panelTypeId' | 'source' | 'interface'>,
): Omit<SavedTimingDto, 'id' | 'updatedAt'> {
  if (!panelTypeById(body.panelTypeId)) {
    throw new AppError(
      400,
      'invalid_input',
      `panelTypeId "${body.panelTypeId}" is not a built-in panel type; GET /api/panel-types lists them.`,
      { issues: [{ path: 'panelTypeId', message: 'unknown panel type' }] },
    );
  }
  try {
    return { name: body.name, panelTypeId: body.panelTypeId, source: body.source, interface: body.interface, ...evaluateTiming(body) };
  } catch (err) {
    throw new AppError(400, 'impossible_timing', `This timing cannot be used: ${(err as Error).message}.`);
  }
}

const dto = (row: SavedTiming): SavedTimingDto => ({ id: row.id, ...evaluate(row), updatedAt: row.updatedAt.toISOString() });

/** A studio's saved timings. */
export class TimingsService {
  async list(studioId: string, panelTypeId?: string): Promise<SavedTimingDto[]> {
    const rows = await SavedTiming.findAll({ where: panelTypeId ? { studioId, panelTypeId } : { studioId }, order: [['name', 'ASC']] });
    return rows.map(dto);
  }

  async get(studioId: string, id: string): Promise<SavedTimingDto> {
    return dto(await this.row(studioId, id));
  }

  async create(studioId: string, userId: string, body: CreateTimingBody): Promise<SavedTimingDto> {
    evaluate(body);
    const row = await SavedTiming.create({ studioId, ...body, createdById: userId, updatedById: userId });
    return dto(row);
  }

  async update(studioId: string, id: string, userId: string, patch: Partial<CreateTimingBody>): Promise<SavedTimingDto> {
    const row = await this.row(studioId, id);
    const next = { name: row.name, panelTypeId: row.panelTypeId, source: row.source, interface: row.interface, ...patch };
    evaluate(next);
    await row.update({ ...next, updatedById: userId });
    return dto(row);
  }

  async remove(studioId: string, id: string): Promise<void> {
    await (await this.row(studioId, id)).destroy();
  }

  private async row(studioId: string, id: string): Promise<SavedTiming> {
    const row = await SavedTiming.findOne({ where: { id, studioId } });
    if (!row) throw notFound('The timing');
    return row;
  }
}
