import type { Kysely } from 'kysely';
import type { Database } from '@kiln/shared/db';
import { expandSweep, Role, type SweepAxis } from '@kiln/shared';

/**
 * The fictional demo lab: the Geometric Flows Group at the (invented) Vellmar
 * Institute, with one outside collaborator. None of these people exist.
 */
export const DEMO_PEOPLE = [
  { key: 'admin', email: 'ines.valcourt@vellmar.example', name: 'Ines Valcourt', role: Role.Admin },
  { key: 'postdoc', email: 'joren.askeland@vellmar.example', name: 'Joren Askeland', role: Role.Researcher },
  { key: 'researcher', email: 'priya.nandakumar@vellmar.example', name: 'Priya Nandakumar', role: Role.Researcher },
  { key: 'collaborator', email: 'emeka.duarte@tessaly-institute.example', name: 'Emeka Duarte', role: Role.Collaborator },
] as const;

export type DemoPersonKey = (typeof DEMO_PEOPLE)[number]['key'];

export const DEMO_STUDY = {
  name: 'Ellipsoid targets past the oscillation threshold',
  description:
    'Does the flow from the identity of S^3 into elongated ellipsoids converge, or form a singularity, as the axis ratio crosses 2√2?',
};

/** Two small sweeps that run in seconds on the demo workers, so every page has something to show. */
export const DEMO_SWEEPS: { name: string; base: object; axes: SweepAxis[] }[] = [
  {
    name: 'Demo: S³ into ellipsoids across the threshold 2√2',
    base: {
      domain: { kind: 'sphere', dim: 3 },
      target: { kind: 'ellipsoid', axisRatio: 2 },
      initial: { kind: 'identity' },
      grid: { points: 150 },
      time: { tMax: 100, maxStep: 1 },
      stop: { tension: 1e-8, gradientBound: 1e6 },
    },
    axes: [{ path: 'target.axisRatio', values: [1.5, 2, 2.5, 2.7, 2.9, 3.5, 4, 5] }],
  },
  {
    name: 'Demo: ball B² into S², boundary angle from 0.5π to 1.5π',
    base: {
      domain: { kind: 'ball', dim: 2, boundaryAngle: Math.PI },
      target: { kind: 'sphere' },
      initial: { kind: 'identity' },
      grid: { points: 200 },
      time: { tMax: 50, maxStep: 1 },
      stop: { tension: 1e-8, gradientBound: 1e8 },
    },
    axes: [{ path: 'domain.boundaryAngle', range: { from: 0.5 * Math.PI, to: 1.5 * Math.PI, steps: 6, scale: 'linear' } }],
  },
];

export interface SeedDemoOptions {
  /** Password hashes per demo person (hashing is the caller's job). */
  passwordHashes: Record<DemoPersonKey, string>;
  /** Also create the demo sweeps (the start command does; tests that count runs do not). */
  demoSweeps?: boolean;
  /** When set, the first admin uses this e-mail (KILN_ADMIN_EMAIL) and hash (KILN_ADMIN_PASSWORD). */
  admin?: { email: string; passwordHash: string };
}

export interface SeedDemoResult {
  /** People created by this call (existing ones are left as they are). */
  created: DemoPersonKey[];
  adminEmail: string;
}

/** Creates the demo lab when missing; idempotent, in one transaction. */
export async function seedDemoLab(db: Kysely<Database>, options: SeedDemoOptions): Promise<SeedDemoResult> {
  return db.transaction().execute(async (trx) => {
    const created: DemoPersonKey[] = [];
    const ids = {} as Record<DemoPersonKey, string>;
    for (const person of DEMO_PEOPLE) {
      const email = person.key === 'admin' && options.admin ? options.admin.email.toLowerCase() : person.email;
      const existing = await trx.selectFrom('users').select('id').where('email', '=', email).executeTakeFirst();
      if (existing) {
        ids[person.key] = existing.id;
        if (person.key === 'admin' && options.admin) {
          // An admin named by the environment gets that password and the admin role on every start.
          await trx
            .updateTable('users')
            .set({ password_hash: options.admin.passwordHash, role: Role.Admin, disabled: false, updated_at: new Date() })
            .where('id', '=', existing.id)
            .execute();
        }
        continue;
      }
      const hash = person.key === 'admin' && options.admin ? options.admin.passwordHash : options.passwordHashes[person.key];
      const row = await trx
        .insertInto('users')
        .values({ email, name: person.name, role: person.role, password_hash: hash })
        .returning('id')
        .executeTakeFirstOrThrow();
      ids[person.key] = row.id;
      created.push(person.key);
    }

    const study = await trx.selectFrom('studies').select('id').where('name', '=', DEMO_STUDY.name).executeTakeFirst();
    if (!study) {
      const { id } = await trx
        .insertInto('studies')
        .values({ ...DEMO_STUDY, owner_id: ids.postdoc })
        .returning('id')
        .executeTakeFirstOrThrow();
      await trx
        .insertInto('study_members')
        .values([
          { study_id: id, user_id: ids.postdoc, role: 'owner' },
          { study_id: id, user_id: ids.researcher, role: 'member' },
          { study_id: id, user_id: ids.collaborator, role: 'member' },
        ])
        .execute();
    }
    const demoStudy = await trx.selectFrom('studies').select('id').where('name', '=', DEMO_STUDY.name).executeTakeFirstOrThrow();
    const hasSweeps = await trx.selectFrom('sweeps').select('id').where('study_id', '=', demoStudy.id).executeTakeFirst();
    if (options.demoSweeps && !hasSweeps) {
      for (const sweep of DEMO_SWEEPS) {
        const expansion = expandSweep(sweep.base, sweep.axes);
        if (!expansion.ok) throw new Error(`demo sweep "${sweep.name}": ${expansion.message}`);
        const row = await trx
          .insertInto('sweeps')
          .values({ study_id: demoStudy.id, owner_id: ids.postdoc, name: sweep.name, base_spec: JSON.stringify(sweep.base), axes: JSON.stringify(sweep.axes), run_count: expansion.runs.length })
          .returning('id')
          .executeTakeFirstOrThrow();
        await trx
          .insertInto('runs')
          .values(
            expansion.runs.map((run) => ({
              study_id: demoStudy.id,
              sweep_id: row.id,
              owner_id: ids.postdoc,
              sweep_index: run.index,
              axis_values: JSON.stringify(run.axisValues),
              spec: JSON.stringify(run.spec),
            })),
          )
          .execute();
      }
    }
    const adminEmail = options.admin?.email.toLowerCase() ?? DEMO_PEOPLE[0].email;
    return { created, adminEmail };
  });
}
