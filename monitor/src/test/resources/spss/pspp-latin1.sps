* A small dataset whose dictionary and text are in windows-1252: GNU PSPP 1.6.2 (Debian pspp).
SET LOCALE='windows-1252'.
DATA LIST LIST (";") /x (F2.0) town (A12).
BEGIN DATA
1;Zürich
2;Besançon
3;Malmö
END DATA.
VARIABLE LABELS x 'Région (codée)' /town 'Ville où vit le ménage'.
VALUE LABELS x 1 'Île-de-France' 2 'Bourgogne–Franche-Comté' 3 'Skåne'.
VARIABLE LEVEL x (NOMINAL).
