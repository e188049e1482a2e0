/**
 * Declared allergies from what a performer wrote on a signed form ("latex, fragrance and sticking
 * plasters"), linked to the ingredient vocabulary. Only the performer's own words count; nothing is
 * inferred beyond naming an ingredient or an allergen group.
 */
import { resolveDeclaredAllergy, type DeclaredAllergy, type IngredientVocabulary } from './ingredients.ts';

/** Answers that declare nothing. */
const NOTHING = /^(none|no|nil|n\/?a|nothing|not that i know( of)?|no known allergies|nka|-)$/i;
/** Words around the allergen itself: "I am allergic to", "allergy:", "sensitive to". */
const LEAD_IN = /^(?:i(?:'m| am)\s+)?(?:very\s+|mildly\s+)?(?:allergic|allergy|allergies|sensitive|sensitivity|sensitivities|reaction|reacts?)(?:\s+(?:to|with))?\s*[:-]?\s*/i;

function phrases(text: string): string[] {
  return text
    .split(/[,;\n/]|\.\s|\s+(?:and|or|&)\s+/i)
    .map((p) => p.trim().replace(/\.$/, '').replace(LEAD_IN, '').trim())
    .filter((p) => p.length > 0 && !NOTHING.test(p));
}

function push(out: DeclaredAllergy[], a: DeclaredAllergy): void {
  const same = out.some((b) => (a.kind === 'group' ? b.kind === 'group' && b.group === a.group : b.kind === 'ingredient' && b.key === a.key));
  if (!same) out.push(a);
}

/**
 * Each phrase of each answer as a declared allergy: the whole phrase first ("Colophonium", "fragrance");
 * failing that, any run of one to three of its words that names a group or a non-carrier ingredient
 * ("my skin reacts to latex gloves" declares latex). A carrier counts only when named on its own, so
 * "water-based is fine" declares nothing. Phrases that name nothing in the vocabulary are left out.
 */
export function declaredAllergiesFromAnswers(answers: readonly string[], vocabulary: IngredientVocabulary): DeclaredAllergy[] {
  const out: DeclaredAllergy[] = [];
  for (const answer of answers) {
    for (const phrase of phrases(answer)) {
      const whole = resolveDeclaredAllergy(phrase, vocabulary);
      if (whole) {
        push(out, whole);
        continue;
      }
      const words = phrase.split(/\s+/);
      for (let size = Math.min(3, words.length); size >= 1; size--) {
        for (let i = 0; i + size <= words.length; i++) {
          const hit = resolveDeclaredAllergy(words.slice(i, i + size).join(' '), vocabulary);
          if (!hit) continue;
          if (hit.kind === 'ingredient' && vocabulary.byKey.get(hit.key)?.trivial) continue;
          push(out, hit);
        }
      }
    }
  }
  return out;
}
