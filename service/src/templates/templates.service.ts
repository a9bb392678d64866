import { randomUUID } from 'node:crypto';
import {
  BadRequestException,
  ConflictException,
  Injectable,
  NotFoundException,
  UnprocessableEntityException,
} from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { createTwoFilesPatch, diffLines } from 'diff';
import { DataSource, Repository } from 'typeorm';
import type { FigureTemplate } from '../figures/templates.js';
import type { TableTemplate } from '../tables/render.js';
import type { User } from '../users/user.entity.js';
import {
  BUILTIN_PREFIX,
  builtinByKey,
  builtinTemplates,
  sha256Text,
  type BuiltinTemplate,
} from './builtins.js';
import { checkTemplateBody, TemplateBodyError } from './compile-check.js';
import {
  Template,
  TemplatePin,
  TemplateVersion,
  type TemplateKind,
  type TemplateScope,
} from './template.entities.js';

export interface VersionRef {
  templateId: string;
  n: number;
}

export interface TemplateVersionDto {
  templateId: string;
  n: number;
  sha256: string;
  author: string;
  message: string;
  createdAt: string;
}

export interface TemplateDto {
  id: string;
  kind: TemplateKind;
  key: string;
  name: string;
  scope: 'builtin' | TemplateScope;
  forkedFrom: string | null;
  latest: number;
  versions: TemplateVersionDto[];
}

export interface PinDto {
  key: string;
  kind: TemplateKind;
  title: string;
  templateId: string;
  templateName: string;
  n: number;
  /** true when no pin is stored and the built-in version is used */
  isDefault: boolean;
}

/** What the renderers need: the body of the pinned version and the built-in manifest of its slot. */
export interface ResolvedTemplate {
  ref: VersionRef;
  kind: TemplateKind;
  key: string;
  body: string;
  sha256: string;
  figure?: FigureTemplate;
  table?: TableTemplate;
}

const BUILTIN_AUTHOR = 'Foldfolio (built-in)';

export function parseRef(s: string): VersionRef {
  const m = /^(.+)@(\d{1,6})$/.exec(s);
  if (!m)
    throw new BadRequestException(
      `"${s}" is not a template version; write it as <template id>@<version number>.`,
    );
  return { templateId: m[1], n: Number(m[2]) };
}

export function refString(r: VersionRef): string {
  return `${r.templateId}@${r.n}`;
}

function bodyError(e: unknown): never {
  if (e instanceof TemplateBodyError)
    throw new UnprocessableEntityException({ statusCode: 422, message: e.message, line: e.line });
  throw e;
}

@Injectable()
export class TemplatesService {
  constructor(
    private readonly db: DataSource,
    @InjectRepository(Template) private readonly templates: Repository<Template>,
    @InjectRepository(TemplateVersion) private readonly versions: Repository<TemplateVersion>,
    @InjectRepository(TemplatePin) private readonly pins: Repository<TemplatePin>,
  ) {}

  private builtinDto(b: BuiltinTemplate): TemplateDto {
    return {
      id: b.id,
      kind: b.kind,
      key: b.key,
      name: b.name,
      scope: 'builtin',
      forkedFrom: null,
      latest: b.n,
      versions: [
        {
          templateId: b.id,
          n: b.n,
          sha256: b.sha256,
          author: BUILTIN_AUTHOR,
          message: 'Shipped with Foldfolio.',
          createdAt: '2026-01-01T00:00:00.000Z',
        },
      ],
    };
  }

  private versionDto(v: TemplateVersion): TemplateVersionDto {
    return {
      templateId: v.templateId,
      n: v.n,
      sha256: v.sha256,
      author: v.authorName,
      message: v.message,
      createdAt: v.createdAt.toISOString(),
    };
  }

  /** A stored template visible from this manuscript (its own or the lab library's), else 404. */
  private async stored(manuscriptId: string, id: string): Promise<Template> {
    const t = /^[0-9a-f-]{36}$/.test(id) ? await this.templates.findOneBy({ id }) : null;
    if (!t || (t.scope === 'manuscript' && t.manuscriptId !== manuscriptId))
      throw new NotFoundException(
        'There is no such template in this manuscript or the lab library; pick one from the Templates tab.',
      );
    return t;
  }

  private builtin(id: string): BuiltinTemplate {
    const b = builtinTemplates().find((x) => x.id === id);
    if (!b)
      throw new NotFoundException(
        `There is no built-in template "${id.slice(BUILTIN_PREFIX.length)}"; pick one from the Templates tab.`,
      );
    return b;
  }

  async list(manuscriptId: string): Promise<TemplateDto[]> {
    const rows = await this.templates
      .createQueryBuilder('t')
      .where("t.scope = 'lab' OR (t.scope = 'manuscript' AND t.manuscript_id = :m)", {
        m: manuscriptId,
      })
      .orderBy('t.created_at', 'ASC')
      .addOrderBy('t.id', 'ASC')
      .getMany();
    const out = builtinTemplates().map((b) => this.builtinDto(b));
    for (const t of rows) out.push(await this.dto(t));
    return out;
  }

  private async dto(t: Template): Promise<TemplateDto> {
    const vs = await this.versions.find({ where: { templateId: t.id }, order: { n: 'ASC' } });
    return {
      id: t.id,
      kind: t.kind,
      key: t.key,
      name: t.name,
      scope: t.scope,
      forkedFrom: t.forkedFrom,
      latest: vs.length ? vs[vs.length - 1].n : 0,
      versions: vs.map((v) => this.versionDto(v)),
    };
  }

  async get(manuscriptId: string, id: string): Promise<TemplateDto> {
    if (id.startsWith(BUILTIN_PREFIX)) return this.builtinDto(this.builtin(id));
    return this.dto(await this.stored(manuscriptId, id));
  }

  /** One version with its body. */
  async version(
    manuscriptId: string,
    ref: VersionRef,
  ): Promise<TemplateVersionDto & { body: string; kind: TemplateKind; key: string }> {
    if (ref.templateId.startsWith(BUILTIN_PREFIX)) {
      const b = this.builtin(ref.templateId);
      if (ref.n !== b.n)
        throw new NotFoundException(
          `The built-in template ${b.key} has only version ${b.n}; choose that one.`,
        );
      return { ...this.builtinDto(b).versions[0], body: b.body, kind: b.kind, key: b.key };
    }
    const t = await this.stored(manuscriptId, ref.templateId);
    const v = await this.versions.findOneBy({ templateId: t.id, n: ref.n });
    if (!v)
      throw new NotFoundException(
        `Template "${t.name}" has no version ${ref.n}; it has versions 1 to ${await this.versions.countBy({ templateId: t.id })}.`,
      );
    return { ...this.versionDto(v), body: v.body, kind: t.kind, key: t.key };
  }

  async fork(
    manuscriptId: string,
    user: User,
    input: { from: string; scope: TemplateScope; name: string; message?: string },
  ): Promise<TemplateDto> {
    const src = await this.version(manuscriptId, parseRef(input.from));
    const t = this.templates.create({
      id: randomUUID(),
      kind: src.kind,
      key: src.key,
      name: input.name.trim(),
      scope: input.scope,
      manuscriptId: input.scope === 'manuscript' ? manuscriptId : null,
      forkedFrom: input.from,
      createdBy: user.id,
      createdAt: new Date(),
    });
    await this.db.transaction(async (m) => {
      await m.save(t);
      await m.insert(TemplateVersion, {
        templateId: t.id,
        n: 1,
        body: src.body,
        sha256: sha256Text(src.body),
        authorId: user.id,
        authorName: user.displayName,
        message: input.message?.trim() || `Forked from ${input.from}.`,
        createdAt: new Date(),
      });
    });
    return this.dto(t);
  }

  /** Saves a new immutable version numbered after the last one. */
  async save(
    manuscriptId: string,
    user: User,
    id: string,
    input: { body: string; message: string },
  ): Promise<TemplateVersionDto> {
    if (id.startsWith(BUILTIN_PREFIX))
      throw new ConflictException(
        'Built-in templates cannot be changed; fork it into the manuscript or the lab library first.',
      );
    const t = await this.stored(manuscriptId, id);
    try {
      checkTemplateBody(t.kind, input.body);
    } catch (e) {
      bodyError(e);
    }
    return this.db.transaction(async (m) => {
      // lock the template row so two saves get consecutive numbers
      await m.query('SELECT id FROM templates WHERE id = ? FOR UPDATE', [t.id]);
      const [{ last }] = (await m.query(
        'SELECT COALESCE(MAX(n), 0) AS last FROM template_versions WHERE template_id = ?',
        [t.id],
      )) as { last: number | string }[];
      const v = m.create(TemplateVersion, {
        templateId: t.id,
        n: Number(last) + 1,
        body: input.body,
        sha256: sha256Text(input.body),
        authorId: user.id,
        authorName: user.displayName,
        message: input.message.trim(),
        createdAt: new Date(),
      });
      await m.insert(TemplateVersion, v);
      return this.versionDto(v);
    });
  }

  async pinsFor(manuscriptId: string): Promise<PinDto[]> {
    const stored = await this.pins.findBy({ manuscriptId });
    const out: PinDto[] = [];
    for (const b of builtinTemplates()) {
      const p = stored.find((x) => x.key === b.key);
      let templateName = b.name;
      if (p && !p.templateId.startsWith(BUILTIN_PREFIX)) {
        const t = await this.templates.findOneBy({ id: p.templateId });
        templateName = t?.name ?? '(removed template)';
      }
      out.push({
        key: b.key,
        kind: b.kind,
        title: b.name,
        templateId: p?.templateId ?? b.id,
        templateName,
        n: p?.n ?? b.n,
        isDefault: !p,
      });
    }
    return out;
  }

  async pin(manuscriptId: string, user: User, key: string, ref: VersionRef): Promise<PinDto> {
    const b = builtinByKey(key);
    if (!b)
      throw new NotFoundException(
        `There is no template slot "${key}"; pick one from the Templates tab.`,
      );
    const v = await this.version(manuscriptId, ref);
    if (v.key !== key)
      throw new BadRequestException(
        `That version belongs to the ${v.key} slot, not ${key}; pin a version forked from ${key}.`,
      );
    await this.pins.save({
      manuscriptId,
      key,
      templateId: ref.templateId,
      n: ref.n,
      pinnedBy: user.id,
      pinnedAt: new Date(),
    });
    return (await this.pinsFor(manuscriptId)).find((p) => p.key === key)!;
  }

  /** The version a manuscript renders for a slot (its pin, else the built-in). */
  async resolve(manuscriptId: string, key: string): Promise<ResolvedTemplate> {
    const b = builtinByKey(key);
    if (!b) throw new NotFoundException(`There is no template "${key}"; pick one from the list.`);
    const p = await this.pins.findOneBy({ manuscriptId, key });
    const ref = p ? { templateId: p.templateId, n: p.n } : { templateId: b.id, n: b.n };
    const v = p ? await this.version(manuscriptId, ref) : { body: b.body, sha256: b.sha256 };
    return this.withBody(b, ref, v.body, v.sha256);
  }

  /** A template of this slot with a given body (saved version or an unsaved draft). */
  withBody(b: BuiltinTemplate, ref: VersionRef, body: string, sha256: string): ResolvedTemplate {
    const r: ResolvedTemplate = { ref, kind: b.kind, key: b.key, body, sha256 };
    if (b.figure) r.figure = { manifest: { ...b.figure, version: ref.n }, specText: body };
    if (b.table) r.table = { manifest: { ...b.table, version: ref.n }, source: body };
    return r;
  }

  async diff(
    manuscriptId: string,
    from: VersionRef,
    to: VersionRef,
  ): Promise<{
    from: string;
    to: string;
    patch: string;
    parts: { added: boolean; removed: boolean; value: string }[];
  }> {
    const a = await this.version(manuscriptId, from);
    const b = await this.version(manuscriptId, to);
    const parts = diffLines(a.body, b.body).map((p) => ({
      added: !!p.added,
      removed: !!p.removed,
      value: p.value,
    }));
    return {
      from: refString(from),
      to: refString(to),
      patch: createTwoFilesPatch(refString(from), refString(to), a.body, b.body, '', '', {
        context: 3,
      }),
      parts,
    };
  }
}
