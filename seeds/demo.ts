// The invented demo: program "Cedar Hollow Emergency Medicine" with people in every role,
// and a second program, "Tamsin Ridge Critical Care", with its own people, exams, reviews and
// calibration set (seeds/demo-exams.ts), which also proves that programs stay apart.
// Every name and address here is made up. All demo passwords: DEMO_PASSWORD.
import type { Db } from "../server/db/knex";
import { hashPassword } from "../server/auth/passwords";
import { insertCatalogue } from "../server/repositories/applications";
import { ensureDefaultRubric } from "../server/repositories/rubrics";
import { DEFAULT_CATALOGUE } from "../shared/catalogue";
import type { Role } from "../shared/roles";

export const DEMO_PASSWORD = "soundings-demo";

interface DemoUser {
  email: string;
  name: string;
  roles: Role[];
}

export const DEMO_PROGRAMS: { name: string; slug: string; aeTitle: string; users: DemoUser[] }[] = [
  {
    name: "Cedar Hollow Emergency Medicine",
    slug: "cedar-hollow-em",
    // The called AE title ultrasound machines send this program's studies to.
    aeTitle: "CEDARHOLLOW",
    users: [
      { email: "sonographer@cedarhollow.example", name: "Noa Hartwell", roles: ["sonographer"] },
      { email: "reviewer@cedarhollow.example", name: "Imani Lindqvist", roles: ["reviewer"] },
      { email: "lead@cedarhollow.example", name: "Harriet Quillon", roles: ["qa_lead", "reviewer"] },
      { email: "admin@cedarhollow.example", name: "Owen Pendlebury", roles: ["admin"] },
      { email: "tobias.varga@cedarhollow.example", name: "Tobias Varga", roles: ["sonographer"] },
      { email: "lena.sorvik@cedarhollow.example", name: "Lena Sorvik", roles: ["sonographer"] },
      { email: "amara.dunleavy@cedarhollow.example", name: "Amara Dunleavy", roles: ["sonographer", "reviewer"] },
      { email: "elias.brunnhold@cedarhollow.example", name: "Elias Brunnhold", roles: ["reviewer"] },
    ],
  },
  {
    name: "Tamsin Ridge Critical Care",
    slug: "tamsin-ridge-cc",
    aeTitle: "TAMSINRIDGE",
    users: [
      { email: "admin@tamsinridge.example", name: "Beatrix Oduya", roles: ["admin", "qa_lead"] },
      { email: "sonographer@tamsinridge.example", name: "Caspar Welliver", roles: ["sonographer"] },
      { email: "reviewer@tamsinridge.example", name: "Rosalind Achterberg", roles: ["reviewer"] },
      { email: "ines.falkenrath@tamsinridge.example", name: "Ines Falkenrath", roles: ["reviewer"] },
      { email: "joss.merriday@tamsinridge.example", name: "Joss Merriday", roles: ["sonographer"] },
    ],
  },
];

/**
 * Seeds the demo when the database holds no program yet; returns whether it did. Pass the
 * configured bcrypt cost: seeded accounts must cost as much to check as any other.
 */
export async function seedDemoIfEmpty(db: Db, bcryptRounds: number): Promise<boolean> {
  const hash = await hashPassword(DEMO_PASSWORD, bcryptRounds);
  return db.transaction(async (trx) => {
    // Serialises concurrent first starts: only one seeds.
    await trx.raw("LOCK TABLE programs IN EXCLUSIVE MODE");
    const [{ count }] = await trx("programs").count<{ count: string }[]>("* as count");
    if (Number(count) > 0) return false;
    for (const p of DEMO_PROGRAMS) {
      const [program] = await trx("programs").insert({ name: p.name, slug: p.slug, dicom_ae_title: p.aeTitle }).returning("id");
      await insertCatalogue(trx, program.id, DEFAULT_CATALOGUE);
      await ensureDefaultRubric(trx, program.id);
      for (const u of p.users) {
        const [user] = await trx("users").insert({ email: u.email, name: u.name, password_hash: hash, password_changed_at: trx.fn.now() }).returning("id");
        await trx("memberships").insert({ user_id: user.id, program_id: program.id, roles: u.roles });
      }
    }
    return true;
  });
}
