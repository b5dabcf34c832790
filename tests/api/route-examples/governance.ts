import { eq } from 'drizzle-orm';
import { funds, optionVersions, reviewOptionVersions, reviewRuns, reviewSignOffs, reviews } from '../../../db/schema';
import { insertOption } from '../../helpers/options';
import { insertFinishedRun } from './reports';
import type { Examples, Fixtures } from './types';

/** An option of fx.schemeId on a fund of its own; its version 1 approved (or a draft nobody edited). */
async function option(fx: Fixtures, status: 'approved' | 'draft' = 'approved') {
  const [f] = await fx.db.insert(funds).values({ schemeId: fx.schemeId, name: `Governance fund ${fx.nonce}-${Math.random().toString(36).slice(2, 7)}` }).returning();
  const o = await insertOption(fx.db, fx.schemeId, { name: `Governance option ${fx.nonce}-${Math.random().toString(36).slice(2, 7)}`, glidePath: [{ yearsToRetirement: 0, weights: { [f.id]: 1 } }] }, status);
  return { ...o, fundId: f.id };
}

/** The same option with a second version, a draft that no run or review used. */
async function withDraft(fx: Fixtures) {
  const o = await option(fx);
  const [v2] = await fx.db
    .insert(optionVersions)
    .values({ optionId: o.id, schemeId: fx.schemeId, version: 2, status: 'draft', name: `${o.name} (revised)`, glidePath: [{ yearsToRetirement: 0, weights: { [o.fundId]: 1 } }], basedOnId: o.versionId })
    .returning();
  return { o, v2 };
}

async function emptyReview(fx: Fixtures) {
  const [r] = await fx.db.insert(reviews).values({ schemeId: fx.schemeId, title: `Fixture review ${fx.nonce}` }).returning();
  return r;
}

/** A review with everything a sign-off needs: an approved set, two option versions, a finished run and a decision. */
async function readyReview(fx: Fixtures) {
  const { run, set, options } = await insertFinishedRun(fx.db, fx.schemeId, { paths: 100, tag: fx.nonce });
  const [r] = await fx.db
    .insert(reviews)
    .values({
      schemeId: fx.schemeId,
      title: `Ready review ${fx.nonce}`,
      assumptionSetId: set.id,
      decision: 'option',
      chosenVersionId: options[1].versionId,
      riskAversion: 2,
      lambdaCalibration: 'Fixture calibration',
      reasons: 'Fixture reasons',
    })
    .returning();
  await fx.db.insert(reviewOptionVersions).values(options.map((o, position) => ({ reviewId: r.id, optionVersionId: o.versionId, position })));
  await fx.db.insert(reviewRuns).values({ reviewId: r.id, runId: run.id, position: 0 });
  return r;
}

export const examples: Examples = {
  'GET /schemes/:schemeId/options/:optionId/versions/:versionId': async (fx) => {
    const o = await option(fx);
    return { params: { schemeId: fx.schemeId, optionId: o.id, versionId: o.versionId } };
  },
  'POST /schemes/:schemeId/options/:optionId/versions/:versionId/approve': async (fx) => {
    const o = await option(fx, 'draft');
    return { params: { schemeId: fx.schemeId, optionId: o.id, versionId: o.versionId } };
  },
  'DELETE /schemes/:schemeId/options/:optionId/versions/:versionId': async (fx) => {
    const { o, v2 } = await withDraft(fx);
    return { params: { schemeId: fx.schemeId, optionId: o.id, versionId: v2.id } };
  },
  'GET /schemes/:schemeId/options/:optionId/versions/:versionId/compare/:otherId': async (fx) => {
    const { o, v2 } = await withDraft(fx);
    return { params: { schemeId: fx.schemeId, optionId: o.id, versionId: o.versionId, otherId: v2.id } };
  },
  'PUT /schemes/:schemeId/current-default': async (fx) => ({ params: { schemeId: fx.schemeId }, body: { optionId: (await option(fx)).id } }),

  'GET /schemes/:schemeId/settings': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'PUT /schemes/:schemeId/settings': async (fx) => {
    // Two trustees, so a quorum of two can be set on any scheme the example is aimed at.
    await fx.makeUser('trustee');
    await fx.makeUser('trustee');
    return { params: { schemeId: fx.schemeId }, body: { approvalsRequired: 1, signOffQuorum: 2, reviewIntervalYears: 3, nextReviewDue: '2029-06-30' } };
  },

  'GET /schemes/:schemeId/reviews': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'POST /schemes/:schemeId/reviews': (fx) => ({ params: { schemeId: fx.schemeId }, body: { title: `Default review ${fx.nonce}` } }),
  'GET /schemes/:schemeId/reviews/:reviewId': async (fx) => ({ params: { schemeId: fx.schemeId, reviewId: (await emptyReview(fx)).id } }),
  'PATCH /schemes/:schemeId/reviews/:reviewId': async (fx) => ({
    params: { schemeId: fx.schemeId, reviewId: (await emptyReview(fx)).id },
    body: { reasons: 'The board’s reasons', dissent: '', riskAversion: 3, decision: 'no_change', nextReviewDue: '2030-03-31' },
  }),
  'DELETE /schemes/:schemeId/reviews/:reviewId': async (fx) => ({ params: { schemeId: fx.schemeId, reviewId: (await emptyReview(fx)).id } }),
  'POST /schemes/:schemeId/reviews/:reviewId/sign-off': async (fx) => ({ params: { schemeId: fx.schemeId, reviewId: (await readyReview(fx)).id } }),
  'DELETE /schemes/:schemeId/reviews/:reviewId/sign-off': async (fx) => {
    const r = await emptyReview(fx);
    // Signed by the demo trustee, who withdraws the signature.
    await fx.db.insert(reviewSignOffs).values({ reviewId: r.id, userId: fx.users.trustee.id, signerName: 'Demo trustee' });
    return { params: { schemeId: fx.schemeId, reviewId: r.id } };
  },
  'GET /schemes/:schemeId/reviews/:reviewId/record.pdf': async (fx) => ({ params: { schemeId: fx.schemeId, reviewId: (await emptyReview(fx)).id } }),
};

/** For tests that want the fixtures directly. */
export const governanceFixtures = { option, withDraft, emptyReview, readyReview };
export const reviewRow = async (fx: Fixtures, id: string) => (await fx.db.select().from(reviews).where(eq(reviews.id, id)))[0];
