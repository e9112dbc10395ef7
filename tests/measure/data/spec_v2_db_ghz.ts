! Hand-made from the Touchstone File Format Specification, Version 2.0: R 75 on the option
! line is overridden by [Reference] 50 ([Reference] keyword); GHz, DB format.
[Version] 2.0
# GHz S DB R 75
[Number of Ports] 1
[Number of Frequencies] 3
[Reference] 50
[Matrix Format] Full
[Network Data]
0.43 -6.020599913279624 -90
0.44 -20 0
0.45 -12.041199826559248 45
[End]
! comments may follow [End]
