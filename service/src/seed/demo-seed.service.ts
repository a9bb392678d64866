import { Inject, Injectable, Logger } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import type { MembershipRole, SiteRole } from '@foldfolio/shared';
import { hashPassword } from '../auth/password.js';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { newId } from '../common/tokens.js';
import { Manuscript } from '../manuscripts/manuscript.entity.js';
import { Membership } from '../manuscripts/membership.entity.js';
import { InvitationsService } from '../invitations/invitations.service.js';
import { User } from '../users/user.entity.js';
import { ModelsService } from '../models/models.service.js';
import { buildDemoStructure, demoSpecs } from '@foldfolio/shared';

/** Invented lab and people (no real names); the password is for a local demo only. */
export const DEMO_LAB = 'Tarnwick Institute for Protein Architecture';
export const DEMO_PASSWORD = 'foldfolio-demo';
export const DEMO_PEOPLE: ReadonlyArray<{
  email: string;
  displayName: string;
  siteRole: SiteRole;
  role: MembershipRole;
}> = [
  {
    email: 'ada.quarrington@tarnwick.example',
    displayName: 'Ada Quarrington',
    siteRole: 'admin',
    role: 'owner',
  },
  {
    email: 'bastian.fernvale@tarnwick.example',
    displayName: 'Bastian Fernvale',
    siteRole: 'user',
    role: 'editor',
  },
  {
    email: 'cleo.mirrowin@tarnwick.example',
    displayName: 'Cleo Mirrowin',
    siteRole: 'user',
    role: 'commenter',
  },
];
/** Invited (by e-mail, not yet accepted) so the Outbox and the invitation page have something. */
export const DEMO_INVITEE = 'dara.whitlock@tarnwick.example';
export const DEMO_TITLE =
  'Crystal structure of FdrQ, an invented flavin reductase from the Tarnwick hot-spring metagenome';

/** Seeds the demo data for `npm start`; running it again changes nothing. */
@Injectable()
export class DemoSeedService {
  private readonly log = new Logger('DemoSeed');

  constructor(
    @Inject(APP_CONFIG) private readonly cfg: AppConfig,
    @InjectDataSource() private readonly db: DataSource,
    private readonly invitations: InvitationsService,
    private readonly models: ModelsService,
  ) {}

  async seed(): Promise<void> {
    let newManuscript: string | null = null;
    let ownerId = '';
    const created = await this.db.transaction(async (m) => {
      // Serialise concurrent seeders on one named lock (two `npm start`s at once).
      await m.query("SELECT GET_LOCK('foldfolio_demo_seed', 30)");
      try {
        let added = 0;
        const ids: string[] = [];
        for (const p of DEMO_PEOPLE) {
          const existing = await m.findOneBy(User, { email: p.email });
          if (existing) {
            ids.push(existing.id);
            continue;
          }
          const id = newId();
          await m.insert(User, {
            id,
            email: p.email,
            displayName: p.displayName,
            passwordHash: await hashPassword(DEMO_PASSWORD, this.cfg.bcryptCost),
            siteRole: p.siteRole,
            tokenVersion: 0,
          });
          ids.push(id);
          added++;
        }
        const owner = ids[0];
        ownerId = owner;
        const has: Array<{ id: string }> = await m.query(
          'SELECT ms.id FROM manuscripts ms JOIN memberships mb ON mb.manuscript_id = ms.id WHERE ms.title = ? AND mb.user_id = ? LIMIT 1',
          [DEMO_TITLE, owner],
        );
        if (has.length === 0) {
          const msId = newId();
          await m.insert(Manuscript, {
            id: msId,
            title: DEMO_TITLE,
            status: 'active',
            createdBy: owner,
            lastActivityAt: new Date(),
          });
          for (let k = 0; k < DEMO_PEOPLE.length; k++) {
            await m.insert(Membership, {
              id: newId(),
              manuscriptId: msId,
              userId: ids[k],
              role: DEMO_PEOPLE[k].role,
            });
          }
          added++;
          newManuscript = msId;
        }
        return added;
      } finally {
        await m.query("SELECT RELEASE_LOCK('foldfolio_demo_seed')");
      }
    });
    if (newManuscript) {
      const owner = await this.db.manager.findOneByOrFail(User, { id: ownerId });
      await this.invitations.invite(newManuscript, owner, DEMO_INVITEE, 'reviewer');
    }
    const modelsAdded = await this.seedModels(ownerId);
    this.log.log(
      created + modelsAdded > 0
        ? `demo data seeded (${DEMO_LAB}; sign in as ${DEMO_PEOPLE[0].email} / ${DEMO_PASSWORD})`
        : 'demo data already present',
    );
  }

  /**
   * The demo manuscript's model versions: invented models built by the engine's demo builder
   * (ideal geometry with a few planted faults), analysed by the worker like any upload.
   * Added only while the demo manuscript has no versions, so a second start adds nothing.
   */
  private async seedModels(ownerId: string): Promise<number> {
    const rows: Array<{ id: string; versions: string | number }> = await this.db.query(
      `SELECT ms.id, (SELECT COUNT(*) FROM model_versions mv WHERE mv.manuscript_id = ms.id) AS versions
         FROM manuscripts ms JOIN memberships mb ON mb.manuscript_id = ms.id
        WHERE ms.title = ? AND mb.user_id = ? LIMIT 1`,
      [DEMO_TITLE, ownerId],
    );
    if (rows.length === 0 || Number(rows[0].versions) > 0) return 0;
    const owner = await this.db.manager.findOneByOrFail(User, { id: ownerId });
    // The story: version 1 is the invented three-helix bundle as first refined (planted faults);
    // version 2 is the same model after "re-refinement" (the faults removed), so the version
    // ledger has fixed outliers to show.
    const bundle = demoSpecs().find((d) => d.layout === 'bundle') ?? demoSpecs()[0];
    const first = buildDemoStructure(bundle);
    const second = buildDemoStructure({ ...bundle, faults: [] });
    const faults = first.faults.map((f) => `${f.kind} at ${f.chain} ${f.seq}`).join(', ');
    const versions: Array<[typeof first, string, string]> = [
      [
        first,
        first.fileName,
        `First refinement of ${first.title} — invented demo model built by Foldfolio with planted faults: ${faults}.`,
      ],
      [
        second,
        first.fileName.replace(/(\.cif)$/, '_v2$1'),
        `Re-refined: the planted faults are corrected — invented demo model built by Foldfolio.`,
      ],
    ];
    let added = 0;
    for (const [demo, name, note] of versions) {
      await this.models.addFromBytes(
        rows[0].id,
        owner,
        new TextEncoder().encode(demo.cif),
        name,
        note,
      );
      added++;
    }
    return added;
  }
}
