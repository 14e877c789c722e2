import { describe, expect, it } from 'vitest';
import { UpdateCommunityBody } from './communities.js';
import { UpdateHomeBody } from './homes.js';
import { UpdateBuilderBody } from './builders.js';

describe('PATCH schemas', () => {
  it('keep only the fields a partial update mentions (no defaults that would reset others)', () => {
    expect(UpdateHomeBody.parse({ yearBuilt: 2004 })).toEqual({ yearBuilt: 2004 });
    expect(UpdateCommunityBody.parse({ yearFrom: 2005 })).toEqual({ yearFrom: 2005 });
    expect(UpdateBuilderBody.parse({ name: 'Brook Homes' })).toEqual({ name: 'Brook Homes' });
  });

  it('still validate the fields they are given and refuse an empty body', () => {
    expect(UpdateHomeBody.safeParse({ pipeSizeIn: 5 }).success).toBe(false);
    expect(UpdateHomeBody.safeParse({}).success).toBe(false);
  });
});
