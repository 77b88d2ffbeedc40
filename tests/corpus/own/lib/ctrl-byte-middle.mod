* Invented model file with a control byte in the middle of a card.
.model dmid d is=20p n=1.05
.model dok d is=1p
