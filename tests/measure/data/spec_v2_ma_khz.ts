! Hand-made from the Touchstone File Format Specification, Version 2.0: keywords in mixed
! case (rule 1), kHz, MA format, carriage-return/line-feed line ends (rule 2).
[VERSION] 2.0
# KHZ s ma R 50
[number of ports] 1
[Number Of Frequencies] 3
[network data]
430000 0.5 -90
440000 0.1 0
450000 0.25 45
[END]
