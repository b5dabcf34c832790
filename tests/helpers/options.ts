import { asc, eq, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { defaultOptions, optionVersions, type GlidePathPoint } from '../../db/schema';

export type FixtureOption = { id: string; versionId: string; name: string; description: string; glidePath: GlidePathPoint[] };

/** Inserts options straight into the database, each as its version 1 (approved unless told otherwise). */
export async function insertOptions(db: DbOrTx, schemeId: string, options: { name: string; description?: string; glidePath: GlidePathPoint[] }[], status: 'approved' | 'draft' = 'approved'): Promise<FixtureOption[]> {
  const rows = await db
    .insert(defaultOptions)
    .values(options.map(() => ({ schemeId })))
    .returning();
  const versions = await db
    .insert(optionVersions)
    .values(options.map((o, i) => ({ optionId: rows[i].id, schemeId, version: 1, status, name: o.name, description: o.description ?? '', glidePath: o.glidePath, approvedAt: status === 'approved' ? new Date() : null })))
    .returning();
  return versions.map((v) => ({ id: v.optionId, versionId: v.id, name: v.name, description: v.description, glidePath: v.glidePath }));
}

export async function insertOption(db: DbOrTx, schemeId: string, o: { name: string; description?: string; glidePath: GlidePathPoint[] }, status: 'approved' | 'draft' = 'approved') {
  return (await insertOptions(db, schemeId, [o], status))[0];
}

/** A scheme's options as their newest versions read, ordered by name. */
export async function schemeOptions(db: DbOrTx, schemeId: string): Promise<FixtureOption[]> {
  const rows = await db
    .select({ id: defaultOptions.id, versionId: optionVersions.id, name: optionVersions.name, description: optionVersions.description, glidePath: optionVersions.glidePath })
    .from(defaultOptions)
    .innerJoin(optionVersions, eq(optionVersions.optionId, defaultOptions.id))
    .where(sql`${defaultOptions.schemeId} = ${schemeId} and ${optionVersions.version} = (select max(v.version) from default_option_versions v where v.option_id = ${defaultOptions.id})`)
    .orderBy(asc(optionVersions.name));
  return rows;
}
