* Writes household-pspp.sav, a wave written by GNU PSPP 1.6.2 (Debian pspp) for the import tests:
*   pspp household-pspp.sps        (run in this folder).
* Two discrete user-missing codes and a range, value labels on a number and on a string, a 400-character string,
* a date, a fractional weight; the tenure codes of the household waves.
DATA LIST LIST /hhid (F5.0) satisf (F1.0) income (F8.2) tenure (A4) visited (DATE11) weight (F6.3).
BEGIN DATA
101 1 1200.50 OWN 03-JAN-2025 1.250
102 5 . RENT 04-JAN-2025 0.750
103 8 -1 COUN 05-JAN-2025 1.000
104 9 2400 OWN 06-JAN-2025 1.125
105 2 -7 RENT 07-JAN-2025 0.875
END DATA.
STRING remark (A400).
COMPUTE remark = CONCAT(RTRIM(tenure), ": ", "a remark long enough to need more than one segment of 255 bytes").
COMPUTE remark = CONCAT(RTRIM(remark), " ", "....................................................................................................").
COMPUTE remark = CONCAT(RTRIM(remark), "....................................................................................................").
COMPUTE remark = CONCAT(RTRIM(remark), "........................................................................................end").
VARIABLE LABELS satisf 'Satisfaction with the home' /income 'Monthly income' /tenure 'Tenure of the home'.
VALUE LABELS satisf 1 'Very satisfied' 2 'Satisfied' 3 'Neither' 4 'Dissatisfied' 5 'Very dissatisfied'
  8 'Don''t know' 9 'Refused'
  /tenure 'OWN' 'Owner' 'RENT' 'Private tenant' 'COUN' 'Council tenant'.
MISSING VALUES satisf (8, 9) /income (LO THRU -1).
VARIABLE LEVEL satisf (ORDINAL) /tenure (NOMINAL) /income weight (SCALE).
SAVE OUTFILE='household-pspp.sav'.
