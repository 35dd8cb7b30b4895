import { and, eq } from "drizzle-orm";
import type { MySqlColumn, MySqlTable, MySqlUpdateSetSource } from "drizzle-orm/mysql-core";
import { db } from "../../db/client";
import type { Scope } from "../../scope";
import { notFound, refuseClash, type ServiceResult, type UniqueKeyClash } from "../../command-result";

type CompanyTable = MySqlTable & { id: MySqlColumn; companyId: MySqlColumn };

/**
 * Creates one of the company's rows (rowId null) or changes it. A row of
 * another company is not found; a clash on the table's unique key is a 409.
 */
export async function saveCompanyRow<Table extends CompanyTable>(
  scope: Scope,
  table: Table,
  rowId: number | null,
  values: Omit<Table["$inferInsert"], "id" | "companyId">,
  answers: { notFound: string; clash: UniqueKeyClash },
): Promise<ServiceResult> {
  try {
    if (rowId === null) {
      // Drizzle's generic table types cannot follow the spread; `values` is checked against the table by the signature.
      const row = { ...values, companyId: scope.companyId } as Table["$inferInsert"];
      const [header] = await db().insert(table).values(row);
      return { ok: true, id: header.insertId };
    }
    const [result] = await db()
      .update(table)
      .set(values as unknown as MySqlUpdateSetSource<Table>)
      .where(and(eq(table.companyId, scope.companyId), eq(table.id, rowId)));
    return result.affectedRows === 0 ? notFound(answers.notFound) : { ok: true, id: rowId };
  } catch (error) {
    return refuseClash(error, answers.clash);
  }
}
