import { describe, expect, it } from 'vitest';
import { BOARD_LAMBDA, BOARD_LAMBDA_RANGE, clampLambda } from '../../constants/riskAversion';
import { ROLES } from '../../constants/permissions';
import { roleEnum } from '../../db/schema';
import { BREAK_EVEN_RANGE, ScenarioSchema } from '../../simulation';
import { ReportBody, RunBody } from '../../schemas/runs';

describe('one list, one range', () => {
  it('the database role type is the permission table’s list of roles', () => {
    expect(roleEnum.enumValues).toEqual([...ROLES]);
  });

  it('the board’s λ range lies inside what the engine’s scenario format accepts', () => {
    const engine = ScenarioSchema.shape.riskAversion;
    expect(engine.safeParse(BOARD_LAMBDA.min).success).toBe(true);
    expect(engine.safeParse(BOARD_LAMBDA.max).success).toBe(true);
    // The engine accepts wider values than the board may ask for.
    expect(engine.safeParse(BOARD_LAMBDA.max * 2).success).toBe(true);
    expect(RunBody.shape.riskAversion.safeParse(BOARD_LAMBDA.max * 2).success).toBe(false);
  });

  it('run and report requests, the control and the break-even search use the same range', () => {
    for (const schema of [RunBody.shape.riskAversion, ReportBody.shape.riskAversion]) {
      expect(schema.safeParse(BOARD_LAMBDA.min).success).toBe(true);
      expect(schema.safeParse(BOARD_LAMBDA.min - 0.01).success).toBe(false);
      expect(schema.safeParse(BOARD_LAMBDA.max + 0.01).success).toBe(false);
    }
    expect(clampLambda(-99)).toBe(BOARD_LAMBDA.min);
    expect(clampLambda(99)).toBe(BOARD_LAMBDA.max);
    expect([...BREAK_EVEN_RANGE]).toEqual([...BOARD_LAMBDA_RANGE]);
    expect(BOARD_LAMBDA.presets.every((p) => p >= BOARD_LAMBDA.min && p <= BOARD_LAMBDA.max)).toBe(true);
  });
});
