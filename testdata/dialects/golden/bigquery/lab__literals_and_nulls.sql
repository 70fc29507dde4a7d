-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,safe_ratio' -b visits.note -w 'visits.note in ('\''O'\'''\''Brien'\'', '\''back\slash'\'', '\''ünï 名'\'') or visits.note is null or visits.seen_on between date '\''2024-02-29'\'' and date '\''2024-03-31'\''' -d bigquery
WITH `visits_rows` AS (
  SELECT
    `visits`.`note` AS `visits__note`,
    `visits`.`minutes` AS `total_minutes_arg`
  FROM `lab`.`visits` AS `visits`
  WHERE (((`visits`.`note` IN ('O\'Brien', 'back\\slash', 'ünï 名')) OR (`visits`.`note` IS NULL)) OR ((`visits`.`seen_on` >= DATE '2024-02-29') AND (`visits`.`seen_on` <= DATE '2024-03-31')))
),
`visits_cells` AS (
  SELECT
    `visits__note`,
    0 AS `grouping_id`,
    count(*) AS `visits_n`,
    sum(`total_minutes_arg`) AS `total_minutes`
  FROM `visits_rows`
  GROUP BY `visits__note`
)
SELECT
  `visits__note`,
  `visits_n`,
  (CAST(coalesce(nullif(`total_minutes`, 0), 1) AS FLOAT64) / NULLIF(abs((`visits_n` - 100)), 0)) AS `safe_ratio`,
  `grouping_id`
FROM `visits_cells`
ORDER BY `visits__note` ASC NULLS LAST;
