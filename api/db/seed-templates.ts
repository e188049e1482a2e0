import type { ConsentKind } from '#shared/domain/consent.ts';
import type { Question } from '#shared/domain/questionnaire.ts';

/** The department's starting consent forms, one of each kind. Studios edit them to their own wording. */
export const SEED_TEMPLATES: { kind: ConsentKind; title: string; validityDays: number | null; body: string; questions: Question[] }[] = [
  {
    kind: 'life_casting',
    title: 'Consent to a life cast',
    validityDays: 180,
    body: `## What will happen

The make-up department will take a mould of part of your body (for example your face, head, hands or teeth) so that appliances can be sculpted to fit you. A soft skin-safe material such as alginate or silicone is spread over the area and backed with a rigid shell of plaster bandage. A face or head cast usually takes 15 to 20 minutes from start to finish, of which you hold still for about 5 to 10 minutes while the material sets.

## Your breathing and airway

- Your nostrils and airway are never covered. The team keeps a clear breathing passage open for the whole session and checks it continually.
- If you have a cold, blocked nose, asthma that is not under control, or any other breathing difficulty on the day, tell us: we will not cast your face that day.

## Stopping at any time

- Before we start we agree a **stop signal** with you (for example raising one hand, or tapping the chair three times). If you give it, we stop and remove the material at once. You never need to explain why.
- A second trained person stays with you throughout, watching you and talking you through each step.
- Tell us beforehand if you have ever felt anxious in enclosed spaces (claustrophobia). We can cast in sections, leave the eyes or mouth free, or not cast at all.

## Hair, brows and eyes

- Scalp hair is covered with a cap. Brows, lashes and fine facial hair are coated with a release agent so the material comes away cleanly. A small amount of hair can still be pulled out; tell us if that matters to you.
- Please remove contact lenses before we start. Eyes are closed during a face cast; keep them closed until we tell you it is safe to open them.

## Heat from setting plaster

Plaster bandage gets warm as it sets. We use it only as a thin outer shell over the mould material, never directly on skin, and we never enclose fingers, hands or limbs in setting plaster. If anything feels hot, give the stop signal.

## Afterwards

Your skin may be a little red for a short while. Tell the team or the production's medical staff about any soreness, itching or rash.

By signing you confirm you have read this, had the chance to ask questions, and agree to the life cast described. You may withdraw this consent at any time, as easily as you gave it.`,
    questions: [
      { id: 'area', type: 'choice', label: 'Which area will be cast?', options: ['Face', 'Full head', 'Hands', 'Teeth', 'Body (other)'], medical: false, required: true },
      { id: 'stop_signal', type: 'short_text', label: 'The stop signal we agreed', help: 'For example: raise the right hand', medical: false, required: true },
      { id: 'claustrophobia', type: 'yes_no', label: 'Have you ever felt anxious or panicky in enclosed spaces?', medical: true, required: true },
      { id: 'breathing', type: 'yes_no', label: 'Do you have a cold, blocked nose, asthma or any other breathing difficulty today?', medical: true, required: true },
      { id: 'skin_conditions', type: 'short_text', label: 'Skin conditions or allergies we should know about (leave blank if none)', medical: true, required: false },
      { id: 'contact_lenses', type: 'yes_no', label: 'Have you removed any contact lenses?', medical: false, required: true },
    ],
  },
  {
    kind: 'patch_testing',
    title: 'Consent to skin patch testing',
    validityDays: 365,
    body: `## Why we test

Before an adhesive, sealer, paint or remover is used on you for long periods, the department places a small amount of it on your skin and checks the area at set times for a reaction. This is a **screening test for the department's products, not a medical diagnosis.**

## What will happen

- Small amounts of the products are applied to an agreed area of skin (usually the inner arm or upper back), sometimes under a covering.
- The designated lead for the production looks at the area at the times on your appointment, records what they see and may take a photo of the test area only.
- You will be told the results for each product.

## What to do

- Keep the test area dry and covered as instructed until the last reading.
- **Remove the test and tell us at once** if you feel burning, strong itching or swelling.
- **Get medical help immediately** for a severe or spreading reaction, swelling of the face or lips, or any difficulty breathing.
- Follow any advice from a dermatologist or doctor over anything the department tells you.

## Your records

Your answers and the test results are health information. Only the production's designated lead and you can see them; other staff see only whether a product is cleared for you.

By signing you agree to the patch test described. You may withdraw this consent at any time; tests already on your skin will then be removed.`,
    questions: [
      { id: 'known_allergies', type: 'short_text', label: 'Known allergies to cosmetics, adhesives, latex, metals, fragrances or plasters (leave blank if none)', medical: true, required: false },
      { id: 'skin_condition', type: 'yes_no', label: 'Do you have eczema, psoriasis or another skin condition at the moment?', medical: true, required: true },
      { id: 'medication', type: 'yes_no', label: 'Are you taking steroid tablets or using steroid creams, or antihistamines?', medical: true, required: true },
      { id: 'sun', type: 'yes_no', label: 'Has the test area been sunburnt or tanned in the last four weeks?', medical: true, required: true },
      { id: 'photos_ok', type: 'yes_no', label: 'May the lead photograph the test area (no face) for your record?', medical: false, required: true },
    ],
  },
  {
    kind: 'application',
    title: 'Consent to prosthetic and make-up application',
    validityDays: 365,
    body: `## What will happen

For this production the make-up department will apply prosthetic appliances and make-up to you: silicone or foam pieces fixed with skin adhesives, sealed and painted, and later removed with removers. An application can take several hours, and appliances may be worn for a full shooting or performance day.

## Products used on you

Only products that are cleared for you after patch testing are used. Before each application an artist checks the products for that day against your record.

## Your comfort and safety

- Tell the artist at once about any burning, itching, tightness or pain. We will stop and remove the product.
- Removers and solvents are used with good ventilation and away from flames; your eyes are protected.
- Breaks, food and water will be planned with you for long wear.
- After removal, the artist checks your skin and records anything other than clear skin; the designated lead follows up.

By signing you agree to the applications described. You may withdraw this consent at any time.`,
    questions: [
      { id: 'wear_hours', type: 'choice', label: 'Longest wear you are comfortable agreeing to today', options: ['Up to 4 hours', 'Up to 8 hours', 'Up to 12 hours'], medical: false, required: true },
      { id: 'sensitivities', type: 'short_text', label: 'Any skin sensitivity the artists should know about (leave blank if none)', medical: true, required: false },
    ],
  },
  {
    kind: 'cast_storage',
    title: 'Storage of your life casts and use of your likeness',
    validityDays: 1825,
    body: `## What we keep

Moulds, positives and cores made from your life casts, and photos and scans of them, are stored by the studio's archive. Each is labelled and its location and every movement are recorded.

## Who owns the casts

The physical casts are made and paid for by the production and held by the studio for the purposes below. Your likeness remains yours: the casts are used only to make appliances and props for you on this production, and for nothing else without your further written agreement.

## How long we keep them

We keep the casts for the period of this consent (five years from signing) and review them at the end of it. You can ask at any time to shorten this.

## What happens at the end

When this consent ends, or as soon as you withdraw it, every cast of you is due for **return to you or destruction**. You choose which. Destruction is done in front of a witness and recorded; you may attend.

By signing you agree to the storage and use described. You may withdraw this consent at any time.`,
    questions: [
      { id: 'end_choice', type: 'choice', label: 'When the casts are no longer kept, I would like them', options: ['Returned to me', 'Destroyed, with a witness', 'Ask me at the time'], medical: false, required: true },
      { id: 'portfolio_photos', type: 'yes_no', label: 'May photos of the finished appliances (not of the casts) be used in the department\'s portfolio?', medical: false, required: true },
    ],
  },
  {
    kind: 'health_data',
    title: 'Use of your health information',
    validityDays: 365,
    body: `## What we record

To keep you safe, the department records health information you give us and information from your patch tests: allergies and skin conditions you declare, reading results, notes and photos of test areas, and any reaction during or after an application.

## Who can see it

Only the production's designated lead and you. Other staff see only whether a product is cleared for you, with a plain reason such as "reacted in testing", never the details.

## Why and for how long

We use it only to decide which products are safe for you on this production and to respond to any reaction. It is kept for the period of this consent and then deleted, unless the law requires us to keep an incident record longer.

## Your rights

You can see everything recorded about you at any time, ask for corrections, and withdraw this consent. Withdrawing stops future use; it does not undo what was recorded while it was in force. Local rules on health data and the production's data-protection officer also apply.`,
    questions: [
      { id: 'share_with_medic', type: 'yes_no', label: "May the designated lead share a reaction report with the production's licensed medical staff if you react?", medical: false, required: true },
    ],
  },
];
