import type { Caution } from "~/domain/advice";
import type { MaterialLine } from "~/domain/quantities";
import type { CutSection } from "~/lib/cut-sheet/cut-list";

/*
 * The crew's tables, shared by the lead page and the printable cut sheet: the cut list, the
 * material order and the crew's safety cautions. No prices here: the crew sees these too.
 */

export function CutListTables({ sections, headingLevel = 3 }: { sections: CutSection[]; headingLevel?: 2 | 3 }) {
  const Heading = headingLevel === 2 ? "h2" : "h3";
  return (
    <div className="flex flex-col gap-4">
      {sections.map((section) => (
        <section key={section.id} aria-labelledby={`cut-${section.id}`} className="cut-section break-inside-avoid">
          <Heading id={`cut-${section.id}`} className="mb-1 text-base font-extrabold">
            {section.title}
          </Heading>
          <table className="w-full text-left text-sm">
            <tbody className="divide-y divide-ash-200">
              {section.rows.map((row) => (
                <tr key={row.key} data-row={row.key}>
                  <th scope="row" className="w-28 py-1.5 pr-3 align-top font-bold text-char-700 sm:w-48">
                    {row.label}
                  </th>
                  <td className="py-1.5 align-top tabular-nums">{row.value}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      ))}
    </div>
  );
}

const UNIT_LABEL: Record<MaterialLine["unit"], [string, string]> = {
  each: ["each", "each"],
  ton: ["ton", "tons"],
  cartridge: ["cartridge", "cartridges"],
  bag: ["bag", "bags"],
  pail: ["pail", "pails"],
  piece: ["piece", "pieces"],
};

/** "45 each", "5.1 tons", "4 cartridges". */
export function formatOrderQuantity(line: Pick<MaterialLine, "quantity" | "unit">): string {
  const [one, many] = UNIT_LABEL[line.unit];
  return `${line.quantity} ${line.quantity === 1 ? one : many}`;
}

export function MaterialsTable({ materials }: { materials: MaterialLine[] }) {
  return (
    <table className="w-full text-left text-sm">
      <thead className="text-xs text-char-500 uppercase">
        <tr>
          <th scope="col" className="py-1.5 pr-3 font-bold">
            Item
          </th>
          <th scope="col" className="py-1.5 pr-3 text-right font-bold">
            Order
          </th>
          <th scope="col" className="hidden py-1.5 font-bold sm:table-cell print:table-cell">
            Note
          </th>
        </tr>
      </thead>
      <tbody className="divide-y divide-ash-200">
        {materials.map((line) => (
          <tr key={line.key} data-material={line.key}>
            <td className="py-1.5 pr-3 align-top font-bold">
              {line.item}
              {line.note ? (
                <span className="block text-xs font-normal text-char-500 sm:hidden print:hidden">{line.note}</span>
              ) : null}
            </td>
            <td className="py-1.5 pr-3 text-right align-top whitespace-nowrap tabular-nums">
              {formatOrderQuantity(line)}
            </td>
            <td className="hidden py-1.5 align-top text-char-600 sm:table-cell print:table-cell">{line.note ?? ""}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** Cautions for the crew (and for everyone), with the reminder that local rules come first. */
export function CrewCautions({ cautions }: { cautions: Caution[] }) {
  return (
    <div>
      <ul className="flex flex-col gap-2 text-sm text-char-800">
        {cautions.map((c) => (
          <li key={c.code} data-code={c.code} className="border-l-3 border-ember-400 pl-3">
            {c.message}
          </li>
        ))}
      </ul>
      <p className="mt-3 text-xs text-char-600">
        These notes do not replace your local codes, your fire authority or licensed trades (gas, electrical): where
        they say more, they win.
      </p>
    </div>
  );
}
