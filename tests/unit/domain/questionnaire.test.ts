import { describe, expect, it } from 'vitest';
import { answersSchemaFor, formatAnswer, QuestionsSchema, type Question } from '#shared/domain/questionnaire.ts';

const QUESTIONS: Question[] = [
  { id: 'lenses', type: 'yes_no', label: 'Lenses out?', medical: false, required: true },
  { id: 'allergies', type: 'short_text', label: 'Allergies', medical: true, required: false },
  { id: 'area', type: 'choice', label: 'Area', options: ['Face', 'Hands'], medical: false, required: true },
  { id: 'signal', type: 'short_text', label: 'Stop signal', medical: false, required: true },
];

describe('answersSchemaFor', () => {
  const schema = answersSchemaFor(QUESTIONS);
  it('accepts a complete set of answers', () => {
    expect(schema.safeParse({ lenses: true, area: 'Face', signal: 'Raise a hand' }).success).toBe(true);
  });
  it('names each missing required answer', () => {
    const r = schema.safeParse({ allergies: 'none' });
    expect(r.success).toBe(false);
    expect(r.error!.issues.map((i) => i.path.join('.')).sort()).toEqual(['area', 'lenses', 'signal']);
  });
  it('refuses a blank required text, an unknown choice, a string for yes/no, and questions not on the form', () => {
    expect(schema.safeParse({ lenses: true, area: 'Face', signal: '   ' }).success).toBe(false);
    expect(schema.safeParse({ lenses: true, area: 'Feet', signal: 'x' }).success).toBe(false);
    expect(schema.safeParse({ lenses: 'yes', area: 'Face', signal: 'x' }).success).toBe(false);
    expect(schema.safeParse({ lenses: true, area: 'Face', signal: 'x', extra: 'y' }).success).toBe(false);
  });
});

describe('QuestionsSchema', () => {
  it('refuses duplicate ids and a choice with fewer than two options', () => {
    expect(QuestionsSchema.safeParse([QUESTIONS[0], QUESTIONS[0]]).success).toBe(false);
    expect(QuestionsSchema.safeParse([{ ...QUESTIONS[2], options: ['Face'] }]).success).toBe(false);
    expect(QuestionsSchema.safeParse(QUESTIONS).success).toBe(true);
  });
});

describe('formatAnswer', () => {
  it('words yes/no and blanks', () => {
    expect(formatAnswer({ type: 'yes_no' }, true)).toBe('Yes');
    expect(formatAnswer({ type: 'yes_no' }, false)).toBe('No');
    // A blank optional answer reads as a declaration of nothing, never as a gap.
    expect(formatAnswer({ type: 'short_text' }, '')).toBe('None declared');
    expect(formatAnswer({ type: 'short_text' }, undefined)).toBe('None declared');
    expect(formatAnswer({ type: 'choice' }, 'Face')).toBe('Face');
  });
});
