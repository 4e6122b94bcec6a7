NAME oven-batching
ROWS
 N  obj
 L  oven_hours
 L  mixer_hours
COLUMNS
    MARKER  'MARKER'  'INTORG'
    batches[rye]  obj  -968.1248796178975
    batches[rye]  oven_hours  1.1445024163313424
    batches[rye]  mixer_hours  0.9873511976691087
    batches[spelt]  obj  -227.3638590066923
    batches[spelt]  oven_hours  1.2694388571505126
    batches[spelt]  mixer_hours  0.704904524308741
    batches[seeded]  obj  -271.63566640285
    batches[seeded]  oven_hours  1.3902702298337282
    batches[seeded]  mixer_hours  0.5010430584561854
    batches[brioche]  obj  -133.94343703775806
    batches[brioche]  oven_hours  1.565013803868879
    batches[brioche]  mixer_hours  1.181422192336489
    batches[sourdough]  obj  -293.49971769158026
    batches[sourdough]  oven_hours  1.0273609309990333
    batches[sourdough]  mixer_hours  0.708880856111813
    batches[barley]  obj  -681.89552874622
    batches[barley]  oven_hours  1.3188377656638601
    batches[barley]  mixer_hours  0.7197902014240357
    MARKER  'MARKER'  'INTEND'
RHS
    RHS  obj  -6168.155816424182
    RHS  oven_hours  33
    RHS  mixer_hours  23
BOUNDS
 UP BND  batches[rye]  8
 UP BND  batches[spelt]  8
 UP BND  batches[seeded]  8
 UP BND  batches[brioche]  8
 UP BND  batches[sourdough]  8
 UP BND  batches[barley]  8
QUADOBJ
    batches[rye]  batches[rye]  188.73319758407857
    batches[spelt]  batches[spelt]  28.63763616212152
    batches[seeded]  batches[seeded]  80.09328635569109
    batches[brioche]  batches[brioche]  39.10402830272437
    batches[sourdough]  batches[sourdough]  54.34211428717465
    batches[barley]  batches[barley]  197.4890792265952
ENDATA
