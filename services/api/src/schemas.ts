import { z } from 'zod';

/** One profile of the CLI's JSON contract. */
export const ProfileSchema = z
  .object({
    name: z.string(),
    source: z.string(),
    units: z.enum(['mm', 'cm', 'm', 'in']),
    properties: z.record(z.string(), z.number()).describe('Property values by trade symbol (A, Ix, Zx, J, Cw…), lengths in `units`.'),
    accuracy: z.record(z.string(), z.number()).describe('Relative error bound or estimate of each property.'),
    warnings: z.array(z.string()),
  })
  .meta({ id: 'Profile' });

/** A drawing (or one profile of a split drawing) that could not be computed, in place of its profile. */
export const FailedProfileSchema = z
  .object({
    name: z.string(),
    source: z.string(),
    error: z.object({ code: z.string().describe('Stable code (see /docs#drawing-codes).'), message: z.string().describe('One line, as the CLI prints it.') }),
  })
  .meta({ id: 'FailedProfile' });

export const EntrySchema = z.union([ProfileSchema, FailedProfileSchema]);

export const DrawingErrorSchema = z
  .object({
    index: z.number().int().optional().describe('Position of the drawing in the job.'),
    name: z.string(),
    source: z.string(),
    code: z.string().describe('Stable code of the fault (see /docs/errors).'),
    message: z.string().describe('One line, as the command line prints it.'),
  })
  .meta({ id: 'DrawingError' });

export const ComputeResponse = z
  .object({
    profiles: z.array(EntrySchema).describe('The CLI\'s JSON: one entry per profile; a drawing of a ZIP (or a profile of a split drawing) that failed is {name, source, error} in place.'),
  })
  .meta({ id: 'ComputeResponse' });

export const CountsSchema = z.object({
  total: z.number().int(),
  done: z.number().int(),
  failed: z.number().int(),
  pending: z.number().int(),
  running: z.number().int(),
  cancelled: z.number().int(),
});

export const JobSchema = z
  .object({
    id: z.string(),
    status: z.enum(['queued', 'running', 'done', 'cancelled']),
    createdAt: z.string().describe('ISO 8601'),
    finishedAt: z.string().nullable(),
    cancelledAt: z.string().nullable(),
    upload: z.object({ name: z.string(), kind: z.string(), bytes: z.number().int(), sha256: z.string() }),
    settings: z.record(z.string(), z.unknown()),
    counts: CountsSchema,
    errors: z.array(DrawingErrorSchema).optional().describe('Drawings that failed (in GET /v1/jobs/{id}).'),
    links: z.object({ self: z.string(), results: z.string() }),
  })
  .meta({ id: 'Job' });

export const JobAccepted = z.object({ id: z.string(), status: z.string(), links: z.object({ self: z.string(), results: z.string() }) }).meta({ id: 'JobAccepted' });

export const JobList = z
  .object({ jobs: z.array(JobSchema), next: z.string().nullable().describe('Cursor of the next page, or null on the last.') })
  .meta({ id: 'JobList' });

export const JobResults = z
  .object({ id: z.string(), status: z.string(), counts: CountsSchema, profiles: z.array(EntrySchema).describe('Entries of the computed and failed drawings, in upload order; pending ones are left out.') })
  .meta({ id: 'JobResults' });

export const ProblemSchema = z
  .object({
    type: z.string(),
    title: z.string(),
    status: z.number().int(),
    detail: z.string(),
    code: z.string(),
    requestId: z.string().optional(),
  })
  .loose()
  .meta({ id: 'Problem' });

export const JobIdParams = z.object({ id: z.string().min(1).max(100) });

export type WireProfile = z.infer<typeof ProfileSchema>;
/** A Profile as the response schema sees it (its property set is an interface, not an index signature). */
export const wire = (p: unknown): WireProfile => p as WireProfile;
export type WireEntry = z.infer<typeof EntrySchema>;
export const wireEntries = (p: readonly unknown[]): WireEntry[] => p as WireEntry[];
