-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,fees,jobs,takings' -b stores.region --totals grand -d duckdb
WITH "sales_rows" AS (
  SELECT
    "stores"."region" AS "stores.region",
    ("sales"."price" * "sales"."qty") AS "revenue_arg"
  FROM "shop"."sales" AS "sales"
  LEFT JOIN "shop"."stores" AS "stores" ON "sales"."store_id" = "stores"."id"
),
"sales_cells" AS (
  SELECT
    "stores.region",
    GROUPING("stores.region") AS "grouping_id",
    sum("revenue_arg") AS "revenue"
  FROM "sales_rows"
  GROUP BY GROUPING SETS (("stores.region"), ())
),
"repairs_rows" AS (
  SELECT
    "stores"."region" AS "stores.region",
    "repairs"."fee" AS "fees_arg",
    "repairs"."id" AS "jobs_arg"
  FROM "shop"."repairs" AS "repairs"
  LEFT JOIN "shop"."stores" AS "stores" ON "repairs"."store_id" = "stores"."id"
),
"repairs_cells" AS (
  SELECT
    "stores.region",
    GROUPING("stores.region") AS "grouping_id",
    sum("fees_arg") AS "fees",
    count("jobs_arg") AS "jobs"
  FROM "repairs_rows"
  GROUP BY GROUPING SETS (("stores.region"), ())
),
"cells" AS (
  SELECT "grouping_id", "stores.region" FROM "sales_cells"
  UNION
  SELECT "grouping_id", "stores.region" FROM "repairs_cells"
)
SELECT
  "cells"."stores.region",
  "sales_cells"."revenue" AS "revenue",
  "repairs_cells"."fees" AS "fees",
  COALESCE("repairs_cells"."jobs", 0) AS "jobs",
  (coalesce(CAST("sales_cells"."revenue" AS DECIMAL(38, 12)), CAST(0 AS DECIMAL(38, 12))) + coalesce(CAST("repairs_cells"."fees" AS DECIMAL(38, 12)), CAST(0 AS DECIMAL(38, 12)))) AS "takings",
  "cells"."grouping_id"
FROM "cells"
  LEFT JOIN "sales_cells" ON "sales_cells"."grouping_id" = "cells"."grouping_id"
    AND "sales_cells"."stores.region" IS NOT DISTINCT FROM "cells"."stores.region"
  LEFT JOIN "repairs_cells" ON "repairs_cells"."grouping_id" = "cells"."grouping_id"
    AND "repairs_cells"."stores.region" IS NOT DISTINCT FROM "cells"."stores.region"
ORDER BY ("cells"."grouping_id" & 1), "cells"."stores.region" ASC NULLS LAST;
