import { describe, expect, it } from 'vitest';
import { draftToBody, newDraft, parseDecimal, type VisitDraft } from './visit-draft';

const ID = '3f1c2a4e-8d4b-4c1e-9a8e-2b7d6c5a4f30';
const FAN = '00000000-0000-4000-8000-000000000001';
const draft = (patch: Partial<VisitDraft> = {}): VisitDraft => ({ ...newDraft({ now: new Date(2026, 4, 12, 9, 30), pipeSizeIn: 3, fanId: FAN }), ...patch });

describe('reading the visit form', () => {
  it('reads numbers as typed on a phone keypad', () => {
    expect(parseDecimal('1,2')).toBe(1.2);
    expect(parseDecimal(' 0.75 ')).toBe(0.75);
    expect(parseDecimal('.5')).toBe(0.5);
    expect(parseDecimal('')).toBeNull();
    expect(parseDecimal('1.2.3')).toBeNaN();
    expect(parseDecimal('abc')).toBeNaN();
  });

  it('defaults to today, the home pipe size and the remembered fan', () => {
    const d = draft();
    expect(d.visitedOn).toBe('2026-05-12');
    expect(d.fanActivatedAt).toBe('2026-05-12T09:30');
    expect(d.pipeSizeIn).toBe('3');
    expect(d.fanId).toBe(FAN);
  });

  it('turns a completed visit into the API body', () => {
    const result = draftToBody(ID, draft({ vacuumInWc: '1,2', pipeLengthFt: '20', elbows: '3', holes: [{ key: 'a', distanceFt: '12', differential: '0.02', unit: 'in_wc' }] }));
    expect(result.errors).toBeNull();
    expect(result.body).toMatchObject({
      id: ID,
      status: 'completed',
      fanId: FAN,
      vacuumInWc: 1.2,
      pipeSizeIn: 3,
      pipeLengthFt: 20,
      elbows: 3,
      pressureField: [{ distanceFt: 12, differential: 0.02, unit: 'in_wc' }],
      fanActivatedAt: new Date(2026, 4, 12, 9, 30).toISOString(),
    });
  });

  it('sends no fan or readings for a declined visit', () => {
    const result = draftToBody(ID, draft({ status: 'declined', vacuumInWc: '1.2' }));
    expect(result.body).toMatchObject({ status: 'declined', fanId: null, vacuumInWc: null, pipeSizeIn: null, pressureField: [] });
  });

  it('names the fields to fix, on the rows the technician sees', () => {
    const result = draftToBody(
      ID,
      draft({
        vacuumInWc: '-0.8',
        elbows: '2.5',
        holes: [
          { key: 'a', distanceFt: '', differential: '', unit: 'Pa' },
          { key: 'b', distanceFt: '15', differential: '', unit: 'Pa' },
        ],
      }),
    );
    expect(result.errors).toMatchObject({ 'pressureField.1.differential': 'enter the differential', elbows: expect.stringContaining('whole number') });
    const schema = draftToBody(ID, draft({ vacuumInWc: '-0.8', pipeLengthFt: '20', elbows: '2', holes: [{ key: 'a', distanceFt: '', differential: '', unit: 'Pa' }, { key: 'b', distanceFt: '500', differential: '3', unit: 'Pa' }] }));
    expect(schema.errors).toMatchObject({ vacuumInWc: 'must be 0 or more', 'pressureField.1.distanceFt': expect.any(String) });
  });

  it('asks what the "other" rework was and keeps it in the notes', () => {
    expect(draftToBody(ID, draft({ vacuumInWc: '1', reworkNeeded: true, reworkReasons: ['other'] })).errors).toEqual({ otherRework: 'describe the other rework' });
    const ok = draftToBody(ID, draft({ vacuumInWc: '1', reworkNeeded: true, reworkReasons: ['other'], otherRework: 'moved the fan', notes: 'Owner present.' }));
    expect(ok.body?.notes).toBe('Other rework: moved the fan\n\nOwner present.');
  });
});
