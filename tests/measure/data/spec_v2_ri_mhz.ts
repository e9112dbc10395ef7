! Hand-made from the Touchstone File Format Specification, Version 2.0: [Version] first,
! the option line, [Number of Ports] 1, [Number of Frequencies], [Reference] with its value
! on the next line, [Network Data], one frequency split over two
! lines (a line with an even count of numbers continues the frequency before it), [End].
[Version] 2.0
# MHz S RI R 50
[Number of Ports] 1
[Number of Frequencies] 3
[Reference]
50
[Network Data]
430 0 -0.5
440
    0.1 0
450 0.1767766952966369 0.17677669529663687
[End]
