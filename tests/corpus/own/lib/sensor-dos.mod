* Invented dark-current diode models for a light-sensor front end.
* Saved by an old editor: a DOS end-of-file byte follows the last line.
.model dsense d is=20p n=1.05 cjo=12p rs=5
