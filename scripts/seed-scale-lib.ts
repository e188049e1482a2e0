// Bulk loaders for the studio-scale data set. Rows are generated inside PostgreSQL
// (generate_series, unnest of arrays sent once per batch), so a million rows are a few statements.
import type pg from 'pg';
import { BODY_REGIONS, CAST_KINDS } from '../shared/domain/archive-casts.ts';
import { LABEL_CODE_SPACE, labelCodeFromNumber } from '../shared/domain/label-codes.ts';
import { AUDIT_ACTION_LABELS } from '../shared/domain/audit.ts';

export interface ScaleSizes {
  performers: number;
  products: number;
  casts: number;
  audit: number;
  readings: number;
  productions: number;
  staff: number;
}

// Invented name parts; any resemblance to a real person is chance.
const GIVEN = ['Ansel', 'Brisa', 'Caius', 'Delphine', 'Emrys', 'Fenna', 'Galen', 'Hesper', 'Ilsa', 'Jory', 'Kestrel', 'Linnea', 'Mireille', 'Nico', 'Orla', 'Perrin', 'Quill', 'Rosalind', 'Soren', 'Tamsin', 'Ulla', 'Vesper', 'Wren', 'Xanthe', 'Yannick', 'Zelda', 'Aurek', 'Bryony', 'Cassian', 'Dorit', 'Elowen', 'Florian'];
const FAMILY = ['Ashcombe', 'Brindlewood', 'Carrow', 'Dunmore', 'Elsworth', 'Fairbairn', 'Gorsefield', 'Hallowell', 'Ingleby', 'Jessamy', 'Kettering', 'Larkspur', 'Marchbank', 'Netherby', 'Oakhurst', 'Pendry', 'Quarrington', 'Rookwood', 'Saltmarsh', 'Thistlewood', 'Underhill', 'Vantreight', 'Whitlock', 'Yarrowby', 'Zennor', 'Applegarth', 'Blackmere', 'Coldharbour', 'Drummond-Vey', 'Esterhay', 'Fallowfield', 'Greystoke-Amar'];
// Family names from two invented halves (1,600 of them), so a surname finds a dozen people, as in a real registry.
const FAMILY_HEAD = ['Ash', 'Brin', 'Car', 'Dun', 'Els', 'Fair', 'Gorse', 'Hal', 'Ing', 'Jess', 'Ket', 'Lark', 'March', 'Neth', 'Oak', 'Pen', 'Quar', 'Rook', 'Salt', 'Thist', 'Under', 'Van', 'Whit', 'Yar', 'Zen', 'Apple', 'Black', 'Cold', 'Drum', 'Ester', 'Fallow', 'Grey', 'Holm', 'Ivy', 'Juni', 'Kel', 'Lin', 'Moss', 'Nor', 'Orr'];
const FAMILY_TAIL = ['combe', 'dlewood', 'row', 'more', 'worth', 'bairn', 'field', 'lowell', 'leby', 'amy', 'tering', 'spur', 'bank', 'erby', 'hurst', 'dry', 'rington', 'wood', 'marsh', 'lethorpe', 'hill', 'treight', 'lock', 'rowby', 'nor', 'garth', 'mere', 'harbour', 'mond', 'hay', 'ford', 'stoke', 'gate', 'bridge', 'wick', 'ley', 'stead', 'well', 'by', 'ton'];
const TITLE_A = ['Copper', 'Hollow', 'Winter', 'Silent', 'Paper', 'Amber', 'Iron', 'Glass', 'Salt', 'Velvet', 'Ember', 'Tidal'];
const TITLE_B = ['Orchard', 'Harbour', 'Crown', 'Meridian', 'Lighthouse', 'Garden', 'Signal', 'Cathedral', 'Ferry', 'Archive', 'Comet', 'Valley'];
const MATERIALS = ['alginate', 'gypsum plaster', 'platinum silicone', 'fibreglass', 'dental stone', 'polyurethane resin'];
const CATEGORIES = ['adhesive', 'remover', 'sealer', 'barrier', 'paint', 'pigment', 'silicone', 'foam_latex', 'cap_material', 'cleanser', 'powder', 'other'];
const GROUPS = ['acrylates', 'rosin', 'latex', 'rubber_accelerators', 'fragrance', 'preservatives', 'solvents', 'silicones', 'pigments', 'other'];
const ACTIONS = Object.keys(AUDIT_ACTION_LABELS);

export async function loadStaffAndProductions(c: pg.ClientBase, n: ScaleSizes): Promise<void> {
  await c.query(
    `insert into users (email, display_name)
     select 'staff' || i || '@scale.plinth.test', ($1::text[])[1 + i % cardinality($1::text[])] || ' ' || ($2::text[])[1 + (i / 7) % cardinality($2::text[])] || ' ' || i
     from generate_series(1, $3::int) i`,
    [GIVEN, FAMILY, n.staff],
  );
  await c.query(
    `insert into productions (name, kind, starts_on, ends_on)
     select 'The ' || ($1::text[])[1 + i % cardinality($1::text[])] || ' ' || ($2::text[])[1 + (i / 12) % cardinality($2::text[])] || ' ' || to_char(i, 'FMRN'),
            (array['film','television','stage','other'])[1 + i % 4], current_date - (i * 11), current_date + 200 - i
     from generate_series(1, $3::int) i`,
    [TITLE_A, TITLE_B, n.productions],
  );
  // Every production gets heads, artists and an archivist, and a designated lead, from the staff.
  await c.query(
    `with staff as (select id, row_number() over (order by email) - 1 as k from users where email like '%@scale.plinth.test'),
          prod as (select id, row_number() over (order by name) - 1 as k, count(*) over () as n from productions)
     insert into memberships (user_id, production_id, role)
     select s.id, p.id, (array['head','artist','artist','archivist'])[1 + ((s.k / p.n) % 4)::int]
     from staff s join prod p on s.k % p.n = p.k`,
  );
  await c.query(
    `with staff as (select id, row_number() over (order by email desc) - 1 as k from users where email like '%@scale.plinth.test'),
          prod as (select id, row_number() over (order by name) - 1 as k from productions
                   where not exists (select 1 from lead_appointments l where l.production_id = productions.id and l.ends_at is null))
     insert into lead_appointments (production_id, user_id, starts_at)
     select p.id, s.id, now() - interval '90 days' from prod p join staff s on s.k = p.k`,
  );
}

/** Performers with e-mail addresses, each engaged on one production and one in seven on a second. */
export async function loadPerformers(c: pg.ClientBase, count: number): Promise<void> {
  await c.query(
    `insert into performers (legal_name, preferred_name, email, email_confirmed_at, pronouns)
     select ($1::text[])[1 + (i * 7) % cardinality($1::text[])] || ' ' || s.surname
              || case when i % 5 = 0 then '-' || ($2::text[])[1 + (i / 13) % cardinality($2::text[])] else '' end,
            case when i % 9 = 0 then ($1::text[])[1 + (i / 3) % cardinality($1::text[])] end,
            'performer' || i || '@scale.plinth.test', case when i % 3 > 0 then now() - interval '40 days' end,
            (array['she/her','he/him','they/them',null])[1 + i % 4]
     from generate_series(1, $3::int) i
     cross join lateral (select ($4::text[])[1 + i % cardinality($4::text[])] || ($5::text[])[1 + (i / cardinality($4::text[])) % cardinality($5::text[])] as surname) s`,
    [GIVEN, FAMILY, count, FAMILY_HEAD, FAMILY_TAIL],
  );
  await c.query(
    `with p as (select id, row_number() over (order by email) as i from performers where email like '%@scale.plinth.test'),
          prod as (select id, row_number() over (order by name) - 1 as k, count(*) over () as n from productions)
     insert into engagements (performer_id, production_id, character_name, starts_on)
     select p.id, prod.id, 'Role ' || p.i, current_date - (p.i % 300)::int
     from p join prod on prod.k = p.i % prod.n
     union all
     select p.id, prod.id, 'Second role ' || p.i, current_date - (p.i % 200)::int
     from p join prod on prod.k = (p.i * 7 + 3) % prod.n
     where p.i % 7 = 0 and (p.i * 7 + 3) % prod.n <> p.i % prod.n`,
  );
}

/** Products with one or two formulations (8 listed ingredients each) and three lots. */
export async function loadCatalogue(c: pg.ClientBase, count: number): Promise<void> {
  await c.query(
    `insert into ingredients (inci, inci_key, name_keys, allergen_group)
     select 'Scalonate ' || i, 'scalonate ' || i, array['scalonate ' || i], ($1::text[])[1 + i % cardinality($1::text[])]
     from generate_series(1, 600) i on conflict do nothing`,
    [GROUPS],
  );
  await c.query(
    `insert into products (name, maker, category, exposure)
     select 'Studio ' || initcap(replace(($1::text[])[1 + i % cardinality($1::text[])], '_', ' ')) || ' No. ' || i, 'Workshop ' || (1 + i % 40),
            ($1::text[])[1 + i % cardinality($1::text[])], case when i % 5 = 0 then 'rinse_off' else 'leave_on' end
     from generate_series(1, $2::int) i`,
    [CATEGORIES, count],
  );
  await c.query(
    `insert into product_formulations (product_id, version, inci_label)
     select p.id, v, 'Scalonate ' || (1 + (h + v) % 600) || ', Scalonate ' || (1 + (h * 3 + v) % 600)
     from (select id, (hashtext(name)::bigint & 2147483647) as h from products where name like 'Studio %') p
     cross join generate_series(1, 2) v
     where v = 1 or p.h % 4 = 0`,
  );
  await c.query(
    `update products p set current_formulation_id = f.id
     from (select distinct on (product_id) id, product_id from product_formulations order by product_id, version desc) f
     where f.product_id = p.id and p.current_formulation_id is null`,
  );
  await c.query(
    `with f as (select id, (hashtext(id::text)::bigint & 2147483647) as h from product_formulations where inci_label like 'Scalonate %'),
          ing as (select id, row_number() over (order by inci_key) - 1 as k, count(*) over () as n from ingredients)
     insert into formulation_ingredients (formulation_id, position, label_name, ingredient_id)
     select f.id, pos, 'Scalonate ' || pos, ing.id
     from f cross join generate_series(0, 7) pos join ing on ing.k = (f.h + pos * 97) % ing.n`,
  );
  await c.query(
    `insert into product_lots (product_id, formulation_id, code, expires_on)
     select p.id, p.current_formulation_id, 'L' || lpad(((hashtext(p.id::text)::bigint & 2147483647) % 100000)::text, 5, '0') || '-' || l,
            current_date + (((hashtext(p.id::text)::bigint & 2147483647) + l * 97) % 900 - 120)::int
     from products p cross join generate_series(1, 3) l where p.name like 'Studio %'`,
  );
}

/** Casts spread over the store's shelves and bins, each checked out once and back in, one in two moved shelf. */
export async function loadCasts(c: pg.ClientBase, count: number, progress: (done: number) => void): Promise<void> {
  const taken = new Set((await c.query<{ label_code: string }>('select label_code from casts')).rows.map((r) => r.label_code));
  const performers = (await c.query<{ id: string; production_id: string }>(
    `select distinct on (p.id) p.id, e.production_id from performers p join engagements e on e.performer_id = p.id order by p.id, e.created_at`,
  )).rows;
  const shelves = (await c.query<{ id: string }>(`select id from archive_locations where level in ('shelf','bin') order by code`)).rows.map((r) => r.id);
  const BATCH = 20_000;
  let labelNumber = 104_729;
  for (let i = 0; i < count; i += BATCH) {
    const size = Math.min(BATCH, count - i);
    const labels: string[] = [];
    const performer: string[] = [];
    const production: string[] = [];
    const shelf: string[] = [];
    for (let k = 0; k < size; k++) {
      const n = i + k;
      let label: string;
      do {
        // A stride prime to the code space visits every code once before repeating.
        labelNumber = (labelNumber + 7_919) % LABEL_CODE_SPACE;
        label = labelCodeFromNumber('cast', labelNumber);
      } while (taken.has(label));
      taken.add(label);
      labels.push(label);
      const p = performers[(n * 31) % performers.length]!;
      performer.push(p.id);
      production.push(p.production_id);
      shelf.push(shelves[n % shelves.length]!);
    }
    await c.query(
      `insert into casts (label_code, performer_id, production_id, region, kind, material, made_on, made_by, normal_location_id, current_location_id, since)
       select t.label, t.performer, t.production, ($5::text[])[1 + (t.n % cardinality($5::text[]))::int], ($6::text[])[1 + ((t.n / 4) % cardinality($6::text[]))::int],
              ($7::text[])[1 + (t.n % cardinality($7::text[]))::int], current_date - (t.n % 3650)::int, 'Scale Maker ' || (t.n % 50), t.shelf, t.shelf, now() - (t.n % 400) * interval '1 day'
       from unnest($1::text[], $2::uuid[], $3::uuid[], $4::uuid[]) with ordinality as t(label, performer, production, shelf, n)`,
      [labels, performer, production, shelf, BODY_REGIONS, CAST_KINDS, MATERIALS],
    );
    progress(i + size);
  }
  const place = `jsonb_build_object('kind', 'location', 'locationId', c.current_location_id)`;
  await c.query(
    `insert into cast_movements (cast_id, kind, at, moved_by, authorised_by, from_place, to_place, from_label, to_label, status_before, status_after, reason, due_back_at)
     select c.id, m.kind, c.since - (m.back * interval '1 day'), 'Scale Runner ' || ((hashtext(c.label_code)::bigint & 2147483647) % 40), 'Scale Archivist',
            case m.kind when 'check_out' then ${place} else jsonb_build_object('kind', 'person', 'holder', 'Scale Runner') end,
            case m.kind when 'check_out' then jsonb_build_object('kind', 'person', 'holder', 'Scale Runner') else ${place} end,
            case m.kind when 'check_out' then l.name else 'Scale Runner' end,
            case m.kind when 'check_out' then 'Scale Runner' else l.name end,
            case m.kind when 'check_out' then 'in_store' else 'checked_out' end,
            case m.kind when 'check_out' then 'checked_out' else 'in_store' end,
            case m.kind when 'check_out' then 'Fitting' end,
            case m.kind when 'check_out' then c.since - interval '5 days' end
     from casts c join archive_locations l on l.id = c.current_location_id
     cross join (values ('check_out', 12), ('check_in', 6)) as m(kind, back)
     where c.made_by like 'Scale Maker %'`,
  );
  await c.query(
    `insert into cast_movements (cast_id, kind, at, moved_by, authorised_by, from_place, to_place, from_label, to_label, status_before, status_after, normal_before, normal_after, reason)
     select c.id, 'relocation', c.since, 'Scale Archivist', 'Scale Archivist',
            jsonb_build_object('kind', 'location', 'locationId', c.current_location_id), jsonb_build_object('kind', 'location', 'locationId', c.current_location_id),
            l.name, l.name, 'in_store', 'in_store', c.normal_location_id, c.normal_location_id, 'Shelf reorganised'
     from casts c join archive_locations l on l.id = c.current_location_id
     where c.made_by like 'Scale Maker %' and (hashtext(c.label_code)::bigint & 2147483647) % 2 = 0`,
  );
}

/** Audit entries over two years: actions from the product's own list, about performers and their productions. */
export async function loadAudit(c: pg.ClientBase, count: number, progress: (done: number) => void): Promise<void> {
  const BATCH = 250_000;
  for (let from = 1; from <= count; from += BATCH) {
    const to = Math.min(count, from + BATCH - 1);
    await c.query(
      `with p as (select array_agg(id order by id) as ids from performers),
            pr as (select array_agg(id order by id) as ids from productions),
            u as (select array_agg(id order by id) as ids from users)
       insert into audit_log (at, actor_user_id, action, entity_type, entity_id, production_id, subject_performer_id, details, ip, route)
       select now() - (i * interval '63 seconds'), u.ids[1 + i % cardinality(u.ids)], ($1::text[])[1 + i % cardinality($1::text[])],
              'performer', p.ids[1 + (i * 13) % cardinality(p.ids)], pr.ids[1 + i % cardinality(pr.ids)], p.ids[1 + (i * 13) % cardinality(p.ids)],
              jsonb_build_object('n', i), '10.0.' || (i % 250) || '.' || (i % 199), 'GET /api/performers/:id'
       from p, pr, u, generate_series($2::int, $3::int) i`,
      [ACTIONS, from, to],
    );
    progress(to);
  }
}
