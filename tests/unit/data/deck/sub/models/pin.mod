* model file two levels down
.model dpin_model d(is=10f n=1.05 cj0=40p rs=15)
